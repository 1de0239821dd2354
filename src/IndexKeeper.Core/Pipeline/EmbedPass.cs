using System.Diagnostics;
using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Index;
using IndexKeeper.Core.Queue;
using IndexKeeper.Core.Storage;
using IndexKeeper.Core.Telemetry;

namespace IndexKeeper.Core.Pipeline;

/// <summary>
/// Drains the queue through the active encoder (the embed half of <c>sync</c>, adding to its summary): takes a batch of queued page keys, skips those that
/// already have live vectors under the encoder, encodes the rest, appends them to a segment, and commits
/// (bytes durable first). A failed batch is tried page by page so one bad page does not hold back its
/// neighbours; a failing page is retried with a back-off and quarantined after repeated failures
/// (<see cref="RetryPolicy"/>). Nothing half-done is visible.
/// </summary>
/// <remarks>REQUIRES: the index lock is held; the only writer of the store.</remarks>
public sealed class EmbedPass(
    IndexCatalog catalog,
    VectorStore store,
    PageWordStore words,
    IPageEncoder encoder,
    IReadOnlyDictionary<string, string> rootPaths,
    int batchSize = 32,
    IProgress<ScanProgress>? progress = null,
    RetryPolicy? retry = null)
{
    private readonly RetryPolicy retryPolicy = retry ?? RetryPolicy.Default;

    public void Run(ScanSummary summary, CancellationToken cancellationToken)
    {
        Run(summary, long.MaxValue, QueuePriority.Canary, cancellationToken);
        cancellationToken.ThrowIfCancellationRequested();
    }

    /// <summary>
    /// Embeds at most <paramref name="maxPages"/> pages of priorities up to <paramref name="lowestPriority"/>
    /// (what the gate allows now) and returns how many were embedded. A cancellation ends it between
    /// batches: the batch in flight is either committed whole or not at all.
    /// </summary>
    public long Run(ScanSummary summary, long maxPages, QueuePriority lowestPriority, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(summary);
        // Counting the whole catalog is for the progress bar only (the daemon calls this once per few batches).
        var total = progress is null ? 0 : catalog.Figures().Queued;
        var started = DateTime.UtcNow;
        var stopwatchRun = Stopwatch.StartNew();
        var (vectorsBefore, secondsBefore) = (summary.VectorsWritten, summary.EncoderSeconds);
        var embedded = 0L;
        var allowed = Enum.GetValues<QueuePriority>().Where(p => p <= lowestPriority).ToList();
        while (!cancellationToken.IsCancellationRequested && embedded < maxPages)
        {
            var queued = catalog.Queue.Next((int)Math.Min(batchSize, maxPages - embedded), started, allowed);
            if (queued.Count == 0)
            {
                break;
            }

            var batch = new List<PageToEncode>(queued.Count);
            var satisfied = new List<string>();
            foreach (var entry in queued)
            {
                var page = catalog.Pages.Find(entry.Id);
                if (page is null || page.References <= 0 || catalog.VectorSets.Find(encoder.Identity.Id, entry.Id) is { Live: true })
                {
                    satisfied.Add(entry.Id);
                    continue;
                }

                batch.Add(PageInput.From(page, words, rootPaths));
            }

            catalog.Queue.Remove(satisfied);
            if (batch.Count == 0)
            {
                continue;
            }

            var (done, diskFailed) = EmbedBatch(summary, batch, cancellationToken);
            embedded += done;
            progress?.Report(new ScanProgress("embedding", summary.PagesEmbedded, total, null));
            if (diskFailed)
            {
                break;
            }
        }

        if (embedded > 0)
        {
            // The measured throughput of this encoder, kept for the plan's estimates.
            catalog.History.RecordEmbedding(encoder.Identity.Id, started, stopwatchRun.Elapsed.TotalSeconds, embedded, summary.VectorsWritten - vectorsBefore, summary.EncoderSeconds - secondsBefore);
        }

        return embedded;
    }

    /// <summary>Encodes and commits one batch; on an encoder failure tries its pages one by one. Returns pages embedded and whether the disk failed.</summary>
    private (int Embedded, bool DiskFailed) EmbedBatch(ScanSummary summary, List<PageToEncode> batch, CancellationToken cancellationToken)
    {
        using var activity = CoreTelemetry.Traces.StartActivity("embed batch");
        activity?.SetTag("indexkeeper.pages", batch.Count);
        try
        {
            EncodeAndCommit(summary, batch, cancellationToken);
            return (batch.Count, false);
        }
        catch (IOException ex)
        {
            // The disk, not the pages: they stay queued with a back-off that does not count towards quarantine.
            summary.PagesFailed += batch.Count;
            summary.Problems.Add($"a batch of {batch.Count} pages failed and stays queued: {ex.Message}");
            foreach (var page in batch)
            {
                catalog.Queue.Defer(page.Key.Hex, DateTime.UtcNow + retryPolicy.BaseDelay);
            }

            activity?.SetStatus(ActivityStatusCode.Error, ex.Message);
            return (0, true);
        }
        catch (Exception ex) when (IsPageFailure(ex))
        {
            activity?.SetStatus(ActivityStatusCode.Error, ex.Message);
            if (batch.Count == 1)
            {
                Fail(summary, batch[0], ex);
                return (0, false);
            }
        }

        var embedded = 0;
        foreach (var page in batch)
        {
            cancellationToken.ThrowIfCancellationRequested();
            try
            {
                EncodeAndCommit(summary, [page], cancellationToken);
                embedded++;
            }
            catch (IOException ex)
            {
                summary.PagesFailed++;
                summary.Problems.Add($"page {page.Key.Hex[..12]} failed and stays queued: {ex.Message}");
                catalog.Queue.Defer(page.Key.Hex, DateTime.UtcNow + retryPolicy.BaseDelay);
                return (embedded, true);
            }
            catch (Exception ex) when (IsPageFailure(ex))
            {
                Fail(summary, page, ex);
            }
        }

        return (embedded, false);
    }

    private void EncodeAndCommit(ScanSummary summary, List<PageToEncode> batch, CancellationToken cancellationToken)
    {
        var stopwatch = Stopwatch.StartNew();
        var vectors = encoder.EncodePages(batch, cancellationToken);
        var seconds = stopwatch.Elapsed.TotalSeconds;
        store.AppendAndCommit(encoder.Identity, batch.Select((p, i) => (p.Key, vectors[i])).ToList());
        summary.EncoderSeconds += seconds;
        summary.PagesEmbedded += batch.Count;
        summary.VectorsWritten += vectors.Sum(v => (long)v.Count);
        CoreTelemetry.EncoderDuration.Record(seconds);
        CoreTelemetry.PagesEmbedded.Add(batch.Count);
    }

    private void Fail(ScanSummary summary, PageToEncode page, Exception ex)
    {
        summary.PagesFailed++;
        CoreTelemetry.PagesFailed.Add(1);
        var now = DateTime.UtcNow;
        var attempts = catalog.Queue.RecordFailure(page.Key.Hex, a => retryPolicy.NextTry(a, now), ex.Message, now);
        summary.Problems.Add(attempts >= retryPolicy.MaxAttempts
            ? $"page {page.Key.Hex[..12]} of {page.SourcePath} failed {attempts} times and is quarantined: {ex.Message}"
            : $"page {page.Key.Hex[..12]} of {page.SourcePath} failed (attempt {attempts}) and stays queued: {ex.Message}");
    }

    private static bool IsPageFailure(Exception ex) => ex is InvalidOperationException or ArgumentException or FormatException;
}
