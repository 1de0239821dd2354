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
    /// Pages the centroid lists hand on to the view's own sign-code stage (Hamming MaxSim over all of a page's
    /// vectors, in memory), best by the lists' approximate MaxSim: max(300·k, 3,000, pages / <see cref="HandOnShare"/>).
    /// A count that does not grow with the index lost most of the misses at 100,000 pages (3,000 kept 0.85 of the
    /// exhaustive top-10, 10,000 kept 0.92), and the last exhaustive top-10 page lies deeper in the lists' ranking
    /// the more pages there are (docs/benchmarks.md, <c>serving</c>, fourth run).
    /// </summary>
    public static int FromCentroids(int k, int pages) => Math.Max(Math.Max(300 * k, 3000), pages / HandOnShare);

    /// <summary>One page in this many goes from the lists to the sign-code stage (see <see cref="FromCentroids"/>).</summary>
    public const int HandOnShare = 4;

    /// <summary>
    /// Pages the sign-code stage hands to the float re-rank after the centroid lists: at least 100·k, since at
    /// 10,000 pages re-ranking 1,000 of the 3,000 kept 0.977–0.993 of the exhaustive top-10 and 100 only 0.963–0.973.
    /// </summary>
    public static int RerankedAfterCentroids(int k, int pages) => Math.Max(Reranked(k, pages), 100 * k);

    /// <summary>Centroids each query token probes: the one its vector is assigned to (a second added nothing, measured).</summary>
    public const int Probes = 1;

    /// <summary>
    /// Pages the sign-code stage hands to the exact float re-rank: max(10·k, 100, one in 100 pages). The same
    /// for both candidate sources, so a graph that gives every page ranks exactly as <c>all</c>.
    /// </summary>
    public static int Reranked(int k, int pages) => Math.Max(Math.Max(10 * k, 100), pages / 100);
}
