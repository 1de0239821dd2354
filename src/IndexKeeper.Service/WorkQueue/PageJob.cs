namespace IndexKeeper.Service.WorkQueue;

/// <summary>
/// One page to embed, as the coordinator publishes it: which page key under which encoder, and where a
/// worker reads it (root name, path under the root with '/', 1-based page, the file's SHA-256 when scanned).
/// </summary>
internal sealed record PageJob(string PageKey, string EncoderId, string RootName, string RelativePath, int PageNumber, string FileHash, int Priority);
