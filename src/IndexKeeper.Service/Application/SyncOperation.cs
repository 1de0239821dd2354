using IndexKeeper.Core.Pipeline;

namespace IndexKeeper.Service.Application;

/// <summary><c>sync</c> (and <c>demo</c>): one pass in the foreground — scan, apply drift, embed every queued page, apply drift again.</summary>
/// <remarks>REQUIRES: the index is open for writing and nothing else writes it.</remarks>
public sealed class SyncOperation(OpenIndex index, ScanOperation scan, EmbedBatchOperation embed, DriftOperation drift)
{
    public ScanSummary Run(string command, IProgress<ScanProgress>? progress, CancellationToken cancellationToken)
    {
        var started = DateTime.UtcNow;

        // Opened (and repaired after a crash) before the scan writes anything.
        _ = index.Store;
        var summary = scan.Run(command, progress, cancellationToken);
        embed.RunAll(summary, progress, cancellationToken);

        // The embedding may have finished a migration: the switch-over happens now.
        summary.RecordDrift(drift.Reconcile());
        summary.ElapsedSeconds = (DateTime.UtcNow - started).TotalSeconds;
        return summary;
    }
}
