namespace IndexKeeper.Service.Querying;

/// <summary>The answer to one search, as <c>search --json</c> prints it and the API serves it.</summary>
public sealed class SearchReport
{
    public string Query { get; init; } = string.Empty;

    public string Encoder { get; init; } = string.Empty;

    public int QueryVectors { get; init; }

    public int PagesScanned { get; init; }

    public int CandidatesReranked { get; init; }

    public double ElapsedMilliseconds { get; init; }

    public IReadOnlyList<SearchReportHit> Hits { get; init; } = [];
}
