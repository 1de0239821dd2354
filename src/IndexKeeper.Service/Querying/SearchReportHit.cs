namespace IndexKeeper.Service.Querying;

/// <summary>
/// One page in the ranking: its first location (root, path under the root, 1-based page), its MaxSim
/// score, every other location holding the same page key, and what each query vector matched.
/// </summary>
public sealed class SearchReportHit
{
    public string Root { get; init; } = string.Empty;

    public string Path { get; init; } = string.Empty;

    public int Page { get; init; }

    public double Score { get; init; }

    public string PageKey { get; init; } = string.Empty;

    public IReadOnlyList<PageLocation> AlsoAt { get; init; } = [];

    public IReadOnlyList<SearchReportMatch> Matches { get; init; } = [];
}
