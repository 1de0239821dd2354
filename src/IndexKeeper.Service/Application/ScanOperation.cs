using IndexKeeper.Core.Detect;
using IndexKeeper.Core.Pipeline;

namespace IndexKeeper.Service.Application;

/// <summary>
/// <c>scan</c> and the daemon's walks: Detect → Read → Diff over the roots (<see cref="ScanPass"/>), which
/// queues the page keys that need vectors and embeds nothing. <c>plan</c> previews the same pass.
/// </summary>
/// <remarks>REQUIRES (all but <see cref="Preview"/>): the index is open for writing and nothing else writes it.</remarks>
public sealed class ScanOperation(OpenIndex index, IndexSettings settings, DriftOperation drift)
{
    /// <summary>Every root, then declared drift applied (the pages a new encoder needs are queued too).</summary>
    public ScanSummary Run(string command, IProgress<ScanProgress>? progress, CancellationToken cancellationToken)
    {
        var summary = Pass(settings.Scan, progress).Run(command, cancellationToken);
        summary.RecordDrift(drift.Reconcile());
        return summary;
    }

    /// <summary>The given roots only (the daemon's walks); drift is its caller's to apply.</summary>
    public ScanSummary Walk(string command, IReadOnlyList<RootSpec> roots, CancellationToken cancellationToken) =>
        Pass(settings.Scan with { Roots = roots }, null).Run(command, cancellationToken);

    /// <summary>Only the changed paths the watchers reported.</summary>
    public ScanSummary Paths(string command, IReadOnlyCollection<ChangedPath> paths, CancellationToken cancellationToken) =>
        Pass(settings.Scan, null).RunPaths(command, paths, cancellationToken);

    /// <summary>What <see cref="Run"/> would find, without writing (the plan).</summary>
    public ScanPreview Preview(IProgress<ScanProgress>? progress, CancellationToken cancellationToken) =>
        Pass(settings.Scan, progress).Preview(cancellationToken);

    private ScanPass Pass(ScanSettings scan, IProgress<ScanProgress>? progress) => new(index.Catalog, index.Words, index.Reader, scan, progress);
}
