namespace IndexKeeper.Core.Search;

/// <summary>
/// Where a served search takes its candidate pages from (docs/search.md, "Candidates"); the serving view holds
/// only the structure its source needs. The numbers are written to the serving view file: never change them.
/// </summary>
public enum CandidateSource
{
    /// <summary>Every live page goes to the sign-code stage (the exhaustive two stages); no structure.</summary>
    All = 0,

    /// <summary>The candidate graph of fixed dimensional encodings (MUVERA-style, USearch HNSW).</summary>
    Graph = 1,

    /// <summary>Centroid inverted lists scored by centroid interaction (PLAID-style).</summary>
    Centroids = 2,
}
