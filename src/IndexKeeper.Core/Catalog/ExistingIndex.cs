using System.Globalization;

namespace IndexKeeper.Core.Catalog;

/// <summary>
/// The check a command that only reads or tends an index makes before it opens anything: a mistyped
/// <c>--index</c> must not create an empty index, and a lost catalog must not be replaced by an empty one
/// (opening would then take every segment for an orphan). Checks only; creates and changes nothing.
/// </summary>
public static class ExistingIndex
{
    /// <summary>The folder of segment files inside an index directory.</summary>
    public const string SegmentsFolder = "segments";

    /// <summary>Throws <see cref="IndexMissingException"/> naming what is missing and what to do.</summary>
    public static void Require(string indexDirectory)
    {
        var directory = Path.GetFullPath(indexDirectory);
        if (!Directory.Exists(directory))
        {
            throw new IndexMissingException($"There is no index at '{directory}' (the folder does not exist). Check --index, or run 'indexkeeper sync' to build one there.");
        }

        if (File.Exists(Path.Combine(directory, CatalogSchema.FileName)))
        {
            return;
        }

        var segments = Path.Combine(directory, SegmentsFolder);
        var files = Directory.Exists(segments) ? Directory.EnumerateFiles(segments).Count() : 0;
        throw new IndexMissingException(files == 0
            ? $"There is no index at '{directory}' (no {CatalogSchema.FileName}). Check --index, or run 'indexkeeper sync' to build one there."
            : string.Create(
                CultureInfo.InvariantCulture,
                $"The catalog '{Path.Combine(directory, CatalogSchema.FileName)}' is missing, but {files} segment file(s) are there; they were left untouched. Restore the catalog from a backup, or rebuild it from the segments and the roots (docs/recovery.md)."));
    }
}
