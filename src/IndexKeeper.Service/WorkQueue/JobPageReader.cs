using IndexKeeper.Core.Detect;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding;

namespace IndexKeeper.Service.WorkQueue;

/// <summary>
/// A worker's read of a claimed job: the file under this machine's path for the root, its hash equal to
/// the job's, the page at the job's number with the job's page key. Anything else fails the job back; a
/// stale page is never encoded. The file is hashed for every job; the last document read is kept for the next.
/// </summary>
/// <param name="rootPaths">This worker's path for each root name (the share may be mounted elsewhere here).</param>
internal sealed class JobPageReader(IReadOnlyDictionary<string, string> rootPaths, IFileHasher hasher, IDocumentReader reader, ReadLimits limits)
{
    // The last document read: jobs come claimed in document order, so a manual's pages cost one read, not one each.
    private (string Path, string FileHash, DocumentContent Content)? last;

    /// <summary>The page to encode, or why the job goes back.</summary>
    public (PageToEncode? Page, JobFailure Failure, string Reason) Read(PageJob job, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(job);
        if (!rootPaths.TryGetValue(job.RootName, out var rootPath))
        {
            return (null, JobFailure.Unmapped, $"root '{job.RootName}' has no path on this worker (its Roots settings)");
        }

        var path = Path.Combine(rootPath, job.RelativePath.Replace('/', Path.DirectorySeparatorChar));
        var hash = hasher.Hash(path, cancellationToken);
        if (!hash.Stable)
        {
            return (null, JobFailure.Changed, $"{job.RootName}/{job.RelativePath}: {hash.Status} ({hash.Detail})");
        }

        if (!string.Equals(Convert.ToHexStringLower(hash.Sha256!), job.FileHash, StringComparison.Ordinal))
        {
            return (null, JobFailure.Changed, $"{job.RootName}/{job.RelativePath} changed since it was scanned (another file hash)");
        }

        DocumentContent content;
        if (last is { } cached && cached.Path == path && cached.FileHash == job.FileHash)
        {
            // The same bytes as the previous job's (the hash was just checked): its pages are read already.
            content = cached.Content;
        }
        else
        {
            try
            {
                content = reader.Read(path, limits, cancellationToken);
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
