using System.Collections.Concurrent;

namespace IndexKeeper.Core.Documents.Tools;

/// <summary>
/// Finds an external program and asks its version (the first line that names it), again only when the
/// program's file changed: a package upgrade replaces it, so a long-lived process notices a new LibreOffice
/// or Tesseract without asking the version on every read.
/// </summary>
internal static class ToolVersion
{
    // Only found programs are remembered: one installed while the worker runs is found on the next read.
    private static readonly ConcurrentDictionary<string, (string Path, string Version, FileStamp Stamp)> Known = new(StringComparer.Ordinal);

    /// <summary>The program's full path and version line (asked with <c>--version</c>, poppler's tools with <c>-v</c>).</summary>
    /// <exception cref="DocumentReadException"><see cref="QuarantineReason.ToolMissing"/>, naming the Debian package.</exception>
    public static (string Path, string Version) Require(string program, string versionPrefix, string package, string purpose) =>
        Find(program, versionPrefix) ?? throw new DocumentReadException(
            QuarantineReason.ToolMissing,
            $"{purpose} needs '{program}', which is not installed or does not answer (Debian package {package})");

    /// <summary>The program's full path and version line, or null when it is not installed or does not answer.</summary>
    public static (string Path, string Version)? Find(string program, string versionPrefix)
    {
        var path = ExecutableLocator.Find(program);
        if (path is null)
        {
            return null;
        }

        var stamp = FileStamp.Of(path);
        if (Known.TryGetValue(program, out var known) && known.Path == path && known.Stamp == stamp)
        {
            return (known.Path, known.Version);
        }

        if (Probe(path, versionPrefix) is not { } version)
        {
            return null;
        }

        Known[program] = (path, version, stamp);
        return (path, version);
    }

    private static string? Probe(string path, string versionPrefix)
    {
        try
        {
            var run = ToolRunner.Run(path, [versionPrefix == "pdftoppm" ? "-v" : "--version"], TimeSpan.FromSeconds(60), null, 1 << 20, CancellationToken.None);
            return (run.OutputText + "\n" + run.Error).Split('\n', StringSplitOptions.TrimEntries | StringSplitOptions.RemoveEmptyEntries)
                .FirstOrDefault(l => l.StartsWith(versionPrefix, StringComparison.OrdinalIgnoreCase));
        }
        catch (Exception e) when (e is TimeoutException or InvalidOperationException or System.ComponentModel.Win32Exception)
        {
            return null;
        }
    }

    /// <summary>Size and modification time of the file a path finally names (links followed): what an upgrade changes.</summary>
    private readonly record struct FileStamp(long Length, DateTime WrittenUtc)
    {
        public static FileStamp Of(string path)
        {
            var file = new FileInfo(path);
            var target = file.ResolveLinkTarget(returnFinalTarget: true) as FileInfo ?? file;
            return target.Exists ? new FileStamp(target.Length, target.LastWriteTimeUtc) : default;
        }
    }
}
