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

    /// <summary>Page-word files the run would rewrite (or delete, when no page names them any more).</summary>
    public int WordFiles { get; init; }

    /// <summary>Bytes of page-word files the run would free (the files' dead bytes).</summary>
    public long WordBytesToReclaim { get; init; }
}
