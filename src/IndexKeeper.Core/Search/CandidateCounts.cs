namespace IndexKeeper.Core.Search;

/// <summary>
/// How many pages each stage of a served search keeps, growing with the index (docs/search.md, "Serving view"):
/// the share of pages that tie or nearly tie with the 10th best grows with the index, so a fixed count keeps
/// less of the exhaustive top-k as the index grows (measured, docs/benchmarks.md, <c>serving</c>).
/// </summary>
public static class CandidateCounts
{
    /// <summary>Pages the candidate graph hands on: max(200·k, 2,000, one in 20 pages).</summary>
    public static int FromGraph(int k, int pages) => Math.Max(Math.Max(200 * k, 2000), pages / 20);

    /// <summary>
    /// Pages the centroid lists hand on to the sign-code stage: max(100·k, 1,000), best by approximate MaxSim
    /// (docs/benchmarks.md, <c>serving</c>).
    /// </summary>
    public static int FromCentroids(int k, int pages) => Math.Max(100 * k, 1000);

    /// <summary>Centroids each query token probes in the centroid lists (measured, docs/benchmarks.md, <c>serving</c>).</summary>
    public const int Probes = 2;

    /// <summary>
    /// Pages the sign-code stage hands to the exact float re-rank: max(10·k, 100, one in 100 pages). The same
    /// for both candidate sources, so a graph that gives every page ranks exactly as <c>all</c>.
    /// </summary>
    public static int Reranked(int k, int pages) => Math.Max(Math.Max(10 * k, 100), pages / 100);
}
