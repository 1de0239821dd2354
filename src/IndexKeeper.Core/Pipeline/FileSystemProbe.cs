using IndexKeeper.Core.Detect;

namespace IndexKeeper.Core.Pipeline;

/// <summary>The scan's view of the real file system, through the Detect stage's walker, stat reader and hasher.</summary>
internal sealed class FileSystemProbe : IFileProbe
{
    private readonly IRootWalker walker = RootWalker.Create();
    private readonly IFileHasher hasher = FileHasher.Create();

    public IEnumerable<FoundFile> Walk(RootSpec root, Action<WalkProblem> problem, Action<PassedOverFile> passedOver, CancellationToken cancellationToken) =>
        walker.Walk(root, problem, passedOver, cancellationToken);

    public FileStat? Stat(string path) => FileStatReader.Read(path) is { Kind: EntryKind.RegularFile } entry ? entry.Stat : null;

    public FileHashResult Hash(FoundFile file, CancellationToken cancellationToken) => hasher.Hash(file, cancellationToken);
}
