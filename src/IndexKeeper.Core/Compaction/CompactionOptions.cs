namespace IndexKeeper.Core.Compaction;

/// <summary>
/// The knobs of the compaction policy (docs/compaction.md). The defaults hold space amplification at
/// or under 1.3: every sealed segment stays under 20 % dead, so sealed files are at most 1 / 0.8 = 1.25
/// times their live bytes.
/// </summary>
public sealed class CompactionOptions
{
    /// <summary>Rewrite a sealed segment once this share of its bytes is dead (0 &lt; x &lt; 1).</summary>
    public double DeadShareThreshold { get; init; } = 0.2;

    /// <summary>Segments below this size count as small.</summary>
    public long SmallSegmentBytes { get; init; } = 16L * 1024 * 1024;

    /// <summary>Merge small segments only when at least this many of similar size exist.</summary>
    public int MinSmallSegmentsToMerge { get; init; } = 4;

    /// <summary>Small segments are of similar size when the largest is at most this many times the smallest.</summary>
    public double SimilarSizeRatio { get; init; } = 4.0;

    /// <summary>A job copies at most this many live bytes, and the compactor seals each output at this size.</summary>
    public long TargetSegmentBytes { get; init; } = 256L * 1024 * 1024;

    /// <summary>Every problem with these options, each naming its setting; empty when they are valid.</summary>
    public IReadOnlyList<string> Validate()
    {
        var problems = new List<string>();
        if (!(DeadShareThreshold is > 0 and < 1))
        {
            problems.Add($"{nameof(DeadShareThreshold)} must be between 0 and 1, exclusive (got {DeadShareThreshold}).");
        }

        if (SmallSegmentBytes < 0)
        {
            problems.Add($"{nameof(SmallSegmentBytes)} must not be negative (got {SmallSegmentBytes}).");
        }

        if (MinSmallSegmentsToMerge < 2)
        {
            problems.Add($"{nameof(MinSmallSegmentsToMerge)} must be at least 2 (got {MinSmallSegmentsToMerge}).");
        }

        if (!(SimilarSizeRatio >= 1) || double.IsInfinity(SimilarSizeRatio))
        {
            problems.Add($"{nameof(SimilarSizeRatio)} must be a finite number of at least 1 (got {SimilarSizeRatio}).");
        }

        if (TargetSegmentBytes <= 0 || TargetSegmentBytes < SmallSegmentBytes)
        {
            problems.Add($"{nameof(TargetSegmentBytes)} must be positive and at least {nameof(SmallSegmentBytes)} (got {TargetSegmentBytes}).");
        }

        return problems;
    }

    internal void ThrowIfInvalid()
    {
        var problems = Validate();
        if (problems.Count > 0)
        {
            throw new ArgumentException(string.Join(" ", problems));
        }
    }
}
