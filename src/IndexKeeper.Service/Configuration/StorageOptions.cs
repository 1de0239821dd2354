namespace IndexKeeper.Service.Configuration;

/// <summary>Segment sizes and the compaction policy (docs/compaction.md).</summary>
public sealed class StorageOptions
{
    /// <summary>An open segment is sealed once it reaches this size.</summary>
    public long SealAtMegabytes { get; set; } = 256;

    /// <summary>... or this age, so a quiet index still gets immutable, checksummed files.</summary>
    public double SealAtHours { get; set; } = 24;

    /// <summary>A sealed segment whose dead share passes this is rewritten.</summary>
    public double CompactDeadShare { get; set; } = 0.2;

    /// <summary>Segments under this size count as small; enough small ones of similar size are merged.</summary>
    public long SmallSegmentMegabytes { get; set; } = 16;

    public int MinSmallSegmentsToMerge { get; set; } = 4;
}
