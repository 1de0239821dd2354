namespace IndexKeeper.Service.Querying;

/// <summary>The answer to one search, as <c>search --json</c> prints it and the API serves it.</summary>
public sealed class SearchReport
{
    public string Query { get; init; } = string.Empty;

    /// <summary>Rank of the first hit less one: the filter's offset.</summary>
    public int Offset { get; init; }

    /// <summary>The offset of the next page of hits; null when this page is the last.</summary>
    public int? NextOffset { get; init; }

    /// <summary>The encoder that ranked this query: name and the first 12 digits of its id.</summary>
    public string Encoder { get; init; } = string.Empty;

    /// <summary>The index's serving encoder id; while a migration runs it differs from the active one.</summary>
    public string ServingEncoderId { get; init; } = string.Empty;

    /// <summary>Set when the ranking covers less than the serving encoder's pages (docs/encoders.md, "Search during a migration").</summary>
    public string? Notice { get; init; }

    public int QueryVectors { get; init; }

    public int PagesScanned { get; init; }

    public int CandidatesReranked { get; init; }

    public double ElapsedMilliseconds { get; init; }

    public IReadOnlyList<SearchReportHit> Hits { get; init; } = [];

    /// <summary>
    /// Live vector sets of the ranking encoder whose bytes could not be read (missing segment file, damaged
    /// record): their pages could not be found by this search. Non-zero makes <c>search</c> exit 1.
    /// </summary>
    public int VectorSetsUnreadable { get; init; }
}
