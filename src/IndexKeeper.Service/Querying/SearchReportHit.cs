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

    /// <summary>
    /// Words of the page around the first matched word, in reading order, each matched word in «»; empty
    /// when the page has no words (docs/search.md, "Hits").
    /// </summary>
    public string Snippet { get; init; } = string.Empty;

    /// <summary>Facts of the document at the first location: its size in bytes, modification time (UTC) and kind.</summary>
    public long DocumentSize { get; init; }

    public DateTime DocumentModifiedUtc { get; init; }

    public string DocumentKind { get; init; } = string.Empty;

    /// <summary>The title the document gives itself (PDF document information, HTML title, e-mail subject); null when none.</summary>
    public string? DocumentTitle { get; init; }
}
