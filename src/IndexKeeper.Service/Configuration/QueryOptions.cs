namespace IndexKeeper.Service.Configuration;

/// <summary>
/// Caps on one search (the command and the API alike): a query past them is refused with a message naming
/// the cap, so no query can make a huge answer. Each hit carries one match per query vector, so an answer
/// grows with terms × k.
/// </summary>
public sealed class QueryOptions
{
    /// <summary>Characters of query text at most.</summary>
    public int MaxCharacters { get; set; } = 1000;

    /// <summary>Terms (words between white space) at most; every encoder makes at least one query vector of each.</summary>
    public int MaxTerms { get; set; } = 32;

    /// <summary>The largest k (pages in one answer).</summary>
    public int MaxResults { get; set; } = 100;

    /// <summary>
    /// A page is a hit only when at least one query vector finds a page vector at least this similar (cosine);
    /// a query whose terms match nothing gets no hits (docs/search.md, "Minimum match").
    /// </summary>
    public double MinimumTokenSimilarity { get; set; } = 0.5;

    /// <summary>
    /// Where the candidates of a search come from (docs/search.md, "Candidates"): <c>all</c> hands every live
    /// page to the sign-code stage over the sign codes the serving view holds (the two stages, as fast as
    /// <c>centroids</c> at 100,000 pages and with no training: docs/benchmarks.md, <c>serving</c>, seventh run); <c>graph</c> asks the serving view's candidate
    /// graph (sublinear, but it keeps less of the exhaustive top-10: docs/benchmarks.md, <c>serving</c>);
    /// <c>centroids</c> the serving view's centroid lists (PLAID-style, sublinear).
    /// </summary>
    public string Candidates { get; set; } = "all";

    /// <summary>
    /// With <c>centroids</c>: the daemon retrains the centroid lists, inside a window, when the last recall figure is
    /// below this (0–1; 0: never for the figure; docs/search.md, "Retraining").
    /// </summary>
    public double RetrainBelowRecall { get; set; } = 0.95;

    /// <summary>
    /// With <c>centroids</c>: the daemon also retrains when at least this share of the view's vectors came after its
    /// centroids were trained (0–10; 0: never for the share).
    /// </summary>
    public double RetrainAfterAddedShare { get; set; } = 0.5;
}
