namespace IndexKeeper.Service.Planning;

/// <summary>Compaction the policy would run now (docs/compaction.md).</summary>
public sealed class PlanCompaction
{
    public int Jobs { get; init; }

    public int Segments { get; init; }

    /// <summary>Live bytes the jobs would copy.</summary>
    public long BytesToRewrite { get; init; }

    /// <summary>Bytes on disk the jobs would free (the segments' dead bytes).</summary>
    public long BytesToReclaim { get; init; }
}
