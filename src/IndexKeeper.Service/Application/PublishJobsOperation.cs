using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Queue;
using IndexKeeper.Service.WorkQueue;

namespace IndexKeeper.Service.Application;

/// <summary>
/// The coordinator's half of remote embedding that goes out: due queued pages, as the gate allows them,
/// become jobs in PostgreSQL (page key, active encoder id, where a worker reads the page and the file hash
/// it must find there). The catalog's queue entry stays until the vectors are committed, so a job lost with
/// its database is published again. Pages that need no vectors any more leave the queue here, as in
/// <c>EmbedPass</c>.
/// </summary>
/// <remarks>REQUIRES: the index is open for writing and this is its only writer.</remarks>
internal sealed class PublishJobsOperation(OpenIndex index)
{
    /// <summary>
    /// Publishes at most <paramref name="maxJobs"/> jobs of priorities up to <paramref name="lowestPriority"/>
    /// that <paramref name="published"/> does not hold yet, adding them to it; returns their page keys.
    /// </summary>
    public IReadOnlyList<string> Run(JobTable jobs, HashSet<string> published, int maxJobs, QueuePriority lowestPriority, DateTime nowUtc)
    {
        ArgumentNullException.ThrowIfNull(jobs);
        ArgumentNullException.ThrowIfNull(published);
        if (maxJobs <= 0)
        {
            return [];
        }

        var catalog = index.Catalog;
        var encoderId = index.Encoder.Identity.Id;
        var allowed = Enum.GetValues<QueuePriority>().Where(p => p <= lowestPriority).ToList();
        var batch = new List<PageJob>();
        var satisfied = new List<string>();
        // Pages are queued document by document, so a run's jobs mostly share a few documents: each is read once.
        var documents = new Dictionary<(string Root, string Path), DocumentRecord?>();
        var entries = catalog.Queue.Next(published.Count + maxJobs, nowUtc, allowed).Where(e => !published.Contains(e.Id)).ToList();

        // The page records without their words (a worker reads the page itself) and the vector sets, a few queries for all.
        var sources = catalog.Pages.SourcesOf(entries.Select(e => e.Id));
        var sets = catalog.VectorSets.Find(encoderId, entries.Select(e => e.Id));
        foreach (var entry in entries)
        {
            if (batch.Count >= maxJobs)
            {
                break;
            }

            if (!sources.TryGetValue(entry.Id, out var source) || source.References <= 0 || sets.GetValueOrDefault(entry.Id) is { Live: true })
            {
                satisfied.Add(entry.Id);
                continue;
            }

            if (Where(catalog, documents, entry.Id, source.Root, source.Path, source.Page) is { } at)
            {
                batch.Add(new PageJob(entry.Id, encoderId, at.Root, at.Path, at.Page, at.FileHash, (int)entry.Priority));
            }
        }

        catalog.Queue.Remove(satisfied);
        jobs.Publish(batch);
        foreach (var job in batch)
        {
            published.Add(job.PageKey);
        }

        return batch.Select(j => j.PageKey).ToList();
    }

    /// <summary>A live document holding the page and its position: the page record's own location first, else any holder.</summary>
    private static (string Root, string Path, int Page, string FileHash)? Where(
        IndexCatalog catalog, Dictionary<(string Root, string Path), DocumentRecord?> documents, string pageKey, string root, string path, int number)
    {
        if (!documents.TryGetValue((root, path), out var document))
        {
            document = catalog.Documents.Find(root, path);
            documents[(root, path)] = document;
        }

        if (document is { State: DocumentState.Live } seen
            && number >= 1 && number <= seen.PageKeys.Count && seen.PageKeys[number - 1] == pageKey)
        {
            return (seen.Root, seen.Path, number, seen.FileHash);
        }

        foreach (var holder in catalog.Documents.Holding(pageKey).Where(d => d.State == DocumentState.Live))
        {
            return (holder.Root, holder.Path, holder.PageKeys.IndexOf(pageKey) + 1, holder.FileHash);
        }

        return null;
    }
}
