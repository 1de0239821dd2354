using IndexKeeper.Core.Pipeline;
using IndexKeeper.Core.Queue;

namespace IndexKeeper.Service.Application;

/// <summary>
/// The unit of encoder work: queued pages through the active encoder into the store, committed batch by
/// batch (<see cref="EmbedPass"/>). The daemon runs one under the gate's allowance each turn, <c>sync</c>
/// runs it until the queue is empty, and a remote worker will run the same unit.
/// </summary>
/// <param name="retry">How a failing page is retried before it is quarantined.</param>
/// <remarks>REQUIRES: the index is open for writing and this is its only writer.</remarks>
public sealed class EmbedBatchOperation(OpenIndex index, IndexSettings settings, RetryPolicy retry)
{
    /// <summary>
    /// Embeds at most <paramref name="maxPages"/> pages of priorities up to <paramref name="lowestPriority"/>,
    /// adding to <paramref name="summary"/>; returns how many were embedded.
    /// </summary>
    public long Run(ScanSummary summary, long maxPages, QueuePriority lowestPriority, IProgress<ScanProgress>? progress, CancellationToken cancellationToken) =>
        Pass(progress).Run(summary, maxPages, lowestPriority, cancellationToken);

    /// <summary>Every queued page, whatever its priority; a cancellation is thrown once the batch in flight is done.</summary>
    public void RunAll(ScanSummary summary, IProgress<ScanProgress>? progress, CancellationToken cancellationToken) =>
        Pass(progress).Run(summary, cancellationToken);

    private EmbedPass Pass(IProgress<ScanProgress>? progress) =>
        new(index.Catalog, index.Store, index.Words, index.Encoder, settings.RootPaths, settings.EmbedBatchSize, progress, retry);
}
