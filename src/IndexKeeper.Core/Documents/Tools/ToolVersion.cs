using System.Collections.Concurrent;

namespace IndexKeeper.Core.Documents.Tools;

/// <summary>Finds an external program once per process and asks its version (the first line that names it).</summary>
internal static class ToolVersion
{
    // Only found programs are remembered: one installed while the worker runs is found on the next read.
    private static readonly ConcurrentDictionary<string, (string Path, string Version)> Known = new(StringComparer.Ordinal);

    /// <summary>The program's full path and version line (asked with <c>--version</c>, poppler's tools with <c>-v</c>).</summary>
    /// <exception cref="DocumentReadException"><see cref="QuarantineReason.ToolMissing"/>, naming the Debian package.</exception>
    public static (string Path, string Version) Require(string program, string versionPrefix, string package, string purpose)
    {
        if (Known.TryGetValue(program, out var known))
        {
            return known;
        }

        var found = Probe(program, versionPrefix);
        if (found is { } tool)
        {
            Known[program] = tool;
            return tool;
        }

        throw new DocumentReadException(
            QuarantineReason.ToolMissing,
            $"{purpose} needs '{program}', which is not installed or does not answer (Debian package {package})");
    }

    private static (string, string)? Probe(string program, string versionPrefix)
    {
        var path = ExecutableLocator.Find(program);
        if (path is null)
        {
            return null;
        }

        try
        {
            var run = ToolRunner.Run(path, [versionPrefix == "pdftoppm" ? "-v" : "--version"], TimeSpan.FromSeconds(60), null, 1 << 20, CancellationToken.None);
            var line = (run.OutputText + "\n" + run.Error).Split('\n', StringSplitOptions.TrimEntries | StringSplitOptions.RemoveEmptyEntries)
                .FirstOrDefault(l => l.StartsWith(versionPrefix, StringComparison.OrdinalIgnoreCase));
            return line is null ? null : (path, line);
        }
        catch (Exception e) when (e is TimeoutException or InvalidOperationException or System.ComponentModel.Win32Exception)
        {
            return null;
        }
    }
}
