using IndexKeeper.Core.Pipeline;

namespace IndexKeeper.Service.Application;

/// <summary>
/// Forgetting a root name: every document the index keeps under it is removed, pages no other document holds
/// go with them and their vector sets become dead (compaction reclaims the space). The daemon does it for a
/// configured root gone past <c>Detect:RootGoneGraceHours</c>; <c>forget-root</c> does it for a name no
/// setting names any more (a renamed or retired root), which nothing else ever removes.
/// </summary>
/// <remarks>REQUIRES (<see cref="Run"/>): the index is open for writing and nothing else writes it.</remarks>
public sealed class ForgetRootOperation(OpenIndex index, IndexSettings settings)
{
    /// <summary>What <see cref="Run"/> would do; reads only.</summary>
    public ForgetRootPreview Preview(string root, CancellationToken cancellationToken) => Pass().PreviewForgetRoot(root, cancellationToken);

    public ScanSummary Run(string command, string root, CancellationToken cancellationToken) => Pass().RunForgetRoot(command, root, cancellationToken);

    private ScanPass Pass() => new(index.Catalog, index.Words, index.Reader, settings.Scan, null);
}
