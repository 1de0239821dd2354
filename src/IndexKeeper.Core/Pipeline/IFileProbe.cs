using IndexKeeper.Core.Detect;

namespace IndexKeeper.Core.Pipeline;

/// <summary>The file-system operations a scan needs; the real one is <see cref="FileSystemProbe"/>.</summary>
internal interface IFileProbe
{
    IEnumerable<FoundFile> Walk(RootSpec root, Action<WalkProblem> problem, Action<PassedOverFile> passedOver, CancellationToken cancellationToken);

    /// <summary>Current stat of a regular file, or null when it is gone or is no longer a regular file.</summary>
    FileStat? Stat(string path);

    FileHashResult Hash(FoundFile file, CancellationToken cancellationToken);
}
