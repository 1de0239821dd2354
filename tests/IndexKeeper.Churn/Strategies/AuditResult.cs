namespace IndexKeeper.Churn.Strategies;

/// <summary>
/// The index against the truth after one day.
/// </summary>
/// <param name="Misses">Pages whose content is new today and that the index does not serve: must be 0.</param>
/// <param name="Unserved">Pages of any age the index does not serve (misses included): must be 0.</param>
/// <param name="Rebound">Page positions whose key stood for other content before: a visible change not seen; must be 0.</param>
/// <param name="StaleServed">Live vector sets of the active encoder no file holds, and pages of catalog documents that no longer exist.</param>
/// <param name="SplitContents">Contents that got more than one page key (each extra key costs an encoder call).</param>
/// <param name="ServedBytes">Vector-set bytes of every page position (copies counted again): what a per-file index would hold.</param>
/// <param name="DistinctContents">Distinct page contents in the store.</param>
/// <param name="DistinctKeys">Distinct page keys the catalog's documents hold.</param>
/// <param name="LiveBytes">Record bytes of the active encoder's live vector sets.</param>
/// <param name="BytesByPath">Vector-set bytes of each file's pages.</param>
internal sealed record AuditResult(
    long Misses,
    long Unserved,
    long Rebound,
    long StaleServed,
    long SplitContents,
    long ServedBytes,
    long DistinctContents,
    long DistinctKeys,
    long LiveBytes,
    IReadOnlyDictionary<string, long> BytesByPath);
