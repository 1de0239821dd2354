namespace IndexKeeper.Churn.Report;

/// <summary>The incrementally kept index against one built from scratch over the final store.</summary>
internal sealed record RebuildComparison(
    long IncrementalKeys,
    long RebuildKeys,
    long KeysOnlyInOne,
    long DocumentsDiffering,
    long VectorSetsCompared,
    long VectorSetsDiffering,
    int Queries,
    int QueriesDiffering,
    IReadOnlyList<string> Differences,
    double RebuildSeconds,
    long RebuildEncoderCalls)
{
    public bool Equal => KeysOnlyInOne == 0 && DocumentsDiffering == 0 && VectorSetsDiffering == 0 && QueriesDiffering == 0;
}
