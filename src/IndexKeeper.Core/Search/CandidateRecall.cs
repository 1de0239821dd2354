namespace IndexKeeper.Core.Search;

/// <summary>
/// How much of the exhaustive top-10 a serving view's candidates keep, measured on sample queries
/// (docs/search.md, "Recall"): the mean share of each sample query's exhaustive top-10 the served search returns.
/// </summary>
/// <param name="Recall">Mean share, 0 to 1.</param>
/// <param name="Queries">Sample queries measured.</param>
/// <param name="Generation">The catalog vector-set generation the view showed.</param>
/// <param name="MeasuredAt">When it was measured.</param>
public sealed record CandidateRecall(double Recall, int Queries, long Generation, DateTimeOffset MeasuredAt);
