namespace IndexKeeper.Core.Search;

/// <summary>The hits of one search, best first, and how much work found them.</summary>
/// <param name="PagesScanned">Vector sets the first stage looked at (all of the source).</param>
/// <param name="CandidatesReranked">Vector sets scored exactly on float16.</param>
public sealed record SearchResult(IReadOnlyList<SearchHit> Hits, int PagesScanned, int CandidatesReranked);
