using IndexKeeper.Core.Detect;

namespace IndexKeeper.Core.Pipeline;

/// <summary>The file-system operations a scan needs; the real one is <see cref="FileSystemProbe"/>.</summary>
internal interface IFileProbe
{
    bool RootExists(RootSpec root);

    IEnumerable<FoundFile> Walk(RootSpec root, Action<string> problem, CancellationToken cancellationToken);

    /// <summary>Current stat of a path, or null when it is gone.</summary>
    FileStat? Stat(string path);

    /// <summary>SHA-256 of the file's bytes (lower-case hex), or null when the file changed while read.</summary>
    string? HashIfStable(string path, FileStat expected, CancellationToken cancellationToken);
}
