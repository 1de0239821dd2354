using System.Diagnostics;
using IndexKeeper.Core.Detect;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding;

namespace IndexKeeper.Service.WorkQueue;

/// <summary>
/// A worker's read of a claimed batch: each job's file under this machine's path for the root, its hash equal
/// to the job's, the page at the job's number with the job's page key. Anything else fails the job back; a
/// stale page is never encoded. Each file is hashed once a batch (claims come in document order, so a batch
/// is mostly one or two files); the last document read is kept for the next batch, used only when that
/// batch's hash of the file equals the one it was read under.
/// </summary>
/// <param name="rootPaths">This worker's path for each root name (the share may be mounted elsewhere here).</param>
internal sealed class JobPageReader(IReadOnlyDictionary<string, string> rootPaths, IFileHasher hasher, IDocumentReader reader, ReadLimits limits)
{
    // The last document read: a manual's pages cost one read, not one each, also across batches.
    private (string Path, string FileHash, DocumentContent Content)? last;

    private readonly Stopwatch hashing = new();
    private readonly Stopwatch reading = new();

    /// <summary>Time spent hashing files and reading documents since this reader was made (the worker's stage figures).</summary>
    public (TimeSpan Hashing, TimeSpan Reading) Spent => (hashing.Elapsed, reading.Elapsed);

    /// <summary>For each job of the batch, in order: the page to encode, or why the job goes back.</summary>
    public IReadOnlyList<(PageToEncode? Page, JobFailure Failure, string Reason)> Read(IReadOnlyList<PageJob> jobs, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(jobs);

        // This batch's verdict on each file: hashed at most once, whatever number of its pages were claimed.
        var hashes = new Dictionary<string, (string? Sha256, string Problem)>(StringComparer.Ordinal);
        return jobs.Select(job => Read(job, hashes, cancellationToken)).ToList();
    }

    private (PageToEncode? Page, JobFailure Failure, string Reason) Read(PageJob job, Dictionary<string, (string? Sha256, string Problem)> hashes, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(job);
        if (!rootPaths.TryGetValue(job.RootName, out var rootPath))
        {
            return (null, JobFailure.Unmapped, $"root '{job.RootName}' has no path on this worker (its Roots settings)");
        }

        var path = Path.Combine(rootPath, job.RelativePath.Replace('/', Path.DirectorySeparatorChar));
        if (!hashes.TryGetValue(path, out var hash))
        {
            var result = WorkerStages.Time(hashing, () => hasher.Hash(path, cancellationToken));
            hash = result.Stable ? (Convert.ToHexStringLower(result.Sha256!), string.Empty) : (null, $"{result.Status} ({result.Detail})");
            hashes[path] = hash;
        }

        if (hash.Sha256 is null)
        {
            return (null, JobFailure.Changed, $"{job.RootName}/{job.RelativePath}: {hash.Problem}");
        }

        if (!string.Equals(hash.Sha256, job.FileHash, StringComparison.Ordinal))
        {
            return (null, JobFailure.Changed, $"{job.RootName}/{job.RelativePath} changed since it was scanned (another file hash)");
        }

        DocumentContent content;
        if (last is { } cached && cached.Path == path && cached.FileHash == job.FileHash)
        {
            // The same bytes as the previous read's (this batch's hash was just compared): its pages are read already.
            content = cached.Content;
        }
        else
        {
            try
            {
                content = WorkerStages.Time(reading, () => reader.Read(path, limits, cancellationToken));
            }
            catch (DocumentReadException ex)
            {
                return (null, JobFailure.Failed, $"{job.RootName}/{job.RelativePath}: {ex.Message}");
            }

            last = (path, job.FileHash, content);
        }

        var page = content.Pages.FirstOrDefault(p => p.Number == job.PageNumber);
        if (page is null || page.Key.Hex != job.PageKey)
        {
            return (null, JobFailure.Changed, $"{job.RootName}/{job.RelativePath} page {job.PageNumber} no longer shows page key {job.PageKey[..12]}");
        }

        return (new PageToEncode(page.Key, path, page.Number, page.Width, page.Height, page.Words) { Rotation = page.Rotation }, default, string.Empty);
    }
}
