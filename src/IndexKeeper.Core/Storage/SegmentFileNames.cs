using System.Globalization;

namespace IndexKeeper.Core.Storage;

/// <summary>
/// Names of segment files in an index directory: <c>seg-000042.vec</c> for segment 42 (at least six
/// digits, so a listing sorts by id up to a million segments), and <c>seg-000042.vec.tmp</c> while a
/// compaction output is being written. A temp file is never referenced by the catalog, so a restart may
/// delete every one it finds. Never change: names reach disk.
/// </summary>
public static class SegmentFileNames
{
    public const string Prefix = "seg-";

    public const string Extension = ".vec";

    public const string TempSuffix = ".tmp";

    /// <summary>A pattern for <see cref="Directory.EnumerateFiles(string, string)"/> that matches both kinds.</summary>
    public const string SearchPattern = "seg-*.vec*";

    public static string Name(long segmentId)
    {
        ArgumentOutOfRangeException.ThrowIfNegative(segmentId);
        return Prefix + segmentId.ToString("D6", CultureInfo.InvariantCulture) + Extension;
    }

    public static string TempName(long segmentId) => Name(segmentId) + TempSuffix;

    public static string PathOf(string directory, long segmentId) => Path.Combine(directory, Name(segmentId));

    public static string TempPathOf(string directory, long segmentId) => Path.Combine(directory, TempName(segmentId));

    /// <summary>Recognises a segment file name (no directory part); anything else in the folder is not ours.</summary>
    public static bool TryParse(string fileName, out long segmentId, out bool isTemp)
    {
        segmentId = -1;
        isTemp = fileName.EndsWith(Extension + TempSuffix, StringComparison.Ordinal);
        var core = isTemp ? fileName[..^TempSuffix.Length] : fileName;
        if (!core.StartsWith(Prefix, StringComparison.Ordinal) || !core.EndsWith(Extension, StringComparison.Ordinal))
        {
            return false;
        }

        var digits = core[Prefix.Length..^Extension.Length];
        return digits.Length >= 6 && digits.All(char.IsAsciiDigit)
            && long.TryParse(digits, NumberStyles.None, CultureInfo.InvariantCulture, out segmentId)
            && Name(segmentId) == core;
    }
}
