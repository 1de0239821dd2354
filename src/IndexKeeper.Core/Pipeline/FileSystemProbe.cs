using System.Security.Cryptography;
using IndexKeeper.Core.Detect;

namespace IndexKeeper.Core.Pipeline;

/// <summary>The scan's view of the real file system (walk, stat, hash).</summary>
internal sealed class FileSystemProbe : IFileProbe
{
    public bool RootExists(RootSpec root) => Directory.Exists(root.Path);

    public IEnumerable<FoundFile> Walk(RootSpec root, Action<string> problem, CancellationToken cancellationToken)
    {
        var full = Path.GetFullPath(root.Path);
        var options = new EnumerationOptions { RecurseSubdirectories = true, IgnoreInaccessible = true, AttributesToSkip = FileAttributes.ReparsePoint };
        foreach (var path in Directory.EnumerateFiles(full, "*", options).Order(StringComparer.Ordinal))
        {
            cancellationToken.ThrowIfCancellationRequested();
            if (Stat(path) is { } stat)
            {
                yield return new FoundFile(root.Name, Path.GetRelativePath(full, path).Replace('\\', '/'), path, stat);
            }
        }
    }

    public FileStat? Stat(string path)
    {
        var info = new FileInfo(path);
        return info.Exists ? new FileStat(info.Length, info.LastWriteTimeUtc.Ticks, FileIdentity.None) : null;
    }

    public string? HashIfStable(string path, FileStat expected, CancellationToken cancellationToken)
    {
        using var stream = File.OpenRead(path);
        var hash = Convert.ToHexStringLower(SHA256.HashData(stream));
        return Stat(path) == expected ? hash : null;
    }
}
