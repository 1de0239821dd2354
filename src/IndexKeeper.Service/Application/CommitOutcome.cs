namespace IndexKeeper.Service.Application;

/// <summary>What one <see cref="CommitResultsOperation"/> did with the handed-back jobs.</summary>
internal sealed class CommitOutcome
{
    public int Committed { get; set; }

    public long Vectors { get; set; }

    public int Dropped { get; set; }

    public int Deferred { get; set; }

    public int Failed { get; set; }

    /// <summary>Results never committed because they broke a promise (another encoder id, bad bytes).</summary>
    public int Rejected { get; set; }

    public List<string> Problems { get; } = [];

    /// <summary>The page keys committed (the rest came back without vectors in the index).</summary>
    public HashSet<string> CommittedPages { get; } = new(StringComparer.Ordinal);
}
