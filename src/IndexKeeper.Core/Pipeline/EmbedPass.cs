using System.Diagnostics;
using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Core.Pipeline;

/// <summary>
/// Drains the queue through the active encoder (the embed half of <c>sync</c>, adding to its summary): takes a batch of queued page keys, skips those that
/// already have live vectors under the encoder, encodes the rest, appends them to a segment, and commits
/// (bytes durable first). A failed batch stays queued with a back-off; nothing half-done is visible.
/// </summary>
/// <remarks>REQUIRES: the index lock is held; the only writer of the store.</remarks>
public sealed class EmbedPass(
    IndexCatalog catalog,
    VectorStore store,
    IPageEncoder encoder,
    IReadOnlyDictionary<string, string> rootPaths,
    int batchSize = 32,
    IProgress<ScanProgress>? progress = null)
{
    private static readonly TimeSpan RetryBackOff = TimeSpan.FromMinutes(5);

    public void Run(ScanSummary summary, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(summary);
        var total = catalog.Figures().Queued;
        var started = DateTime.UtcNow;
        var stopwatchRun = Stopwatch.StartNew();
        var (pagesBefore, vectorsBefore, secondsBefore) = (summary.PagesEmbedded, summary.VectorsWritten, summary.EncoderSeconds);
        Drain(summary, total, started, cancellationToken);
        if (summary.PagesEmbedded > pagesBefore)
        {
            // The measured throughput of this encoder, kept for the plan's estimates.
            catalog.RecordEmbedding(encoder.Identity.Id, started, stopwatchRun.Elapsed.TotalSeconds, summary.PagesEmbedded - pagesBefore, summary.VectorsWritten - vectorsBefore, summary.EncoderSeconds - secondsBefore);
        }

        cancellationToken.ThrowIfCancellationRequested();
    }

    private void Drain(ScanSummary summary, long total, DateTime started, CancellationToken cancellationToken)
    {
        while (!cancellationToken.IsCancellationRequested)
        {
            var queued = catalog.NextQueued(batchSize, started);
            if (queued.Count == 0)
            {
                break;
            }

            var batch = new List<PageToEncode>(queued.Count);
            var satisfied = new List<string>();
            foreach (var entry in queued)
            {
                var page = catalog.FindPage(entry.Id);
                if (page is null || page.References <= 0 || catalog.FindVectorSet(encoder.Identity.Id, entry.Id) is { Live: true })
                {
                    satisfied.Add(entry.Id);
                    continue;
                }

                batch.Add(PageInput.From(page, rootPaths));
            }

            catalog.Dequeue(satisfied);
            if (batch.Count == 0)
            {
                continue;
            }

            try
            {
                var stopwatch = Stopwatch.StartNew();
                var vectors = encoder.EncodePages(batch, cancellationToken);
                summary.EncoderSeconds += stopwatch.Elapsed.TotalSeconds;
                store.AppendAndCommit(encoder.Identity, batch.Select((p, i) => (p.Key, vectors[i])).ToList());
                summary.PagesEmbedded += batch.Count;
                summary.VectorsWritten += vectors.Sum(v => (long)v.Count);
            }
            catch (Exception ex) when (ex is IOException or InvalidOperationException or ArgumentException)
            {
                // The batch stays queued; a page that keeps failing is visible in the queue's attempts.
                summary.PagesFailed += batch.Count;
                summary.Problems.Add($"a batch of {batch.Count} pages failed and stays queued: {ex.Message}");
                foreach (var page in batch)
                {
                    catalog.DeferQueued(page.Key.Hex, DateTime.UtcNow + RetryBackOff);
                }

                if (ex is IOException)
                {
                    break;
                }
            }

            progress?.Report(new ScanProgress("embedding", summary.PagesEmbedded, total, null));
        }
    }
}
