namespace IndexKeeper.Core.Index;

/// <summary>One segment file that is missing or damaged, and what its damage costs.</summary>
public sealed class SegmentDamage
{
    public long SegmentId { get; init; }

    public string File { get; init; } = string.Empty;

    public bool Missing { get; init; }

    /// <summary>Why no record of the file can be read (missing, bad header, another encoder), or null.</summary>
    public string? FileProblem { get; init; }

    /// <summary>Why the seal does not hold (checked by verify only); with every record readable nothing is lost.</summary>
    public string? SealProblem { get; init; }

    /// <summary>Vector sets (live or dead) the catalog places in this file whose bytes cannot be read.</summary>
    public IReadOnlyList<UnreadableVectorSet> VectorSetsUnreadable { get; init; } = [];

    /// <summary>Page keys that lost their live vector set here.</summary>
    public IReadOnlyList<string> Pages { get; init; } = [];

    /// <summary>Documents (root/path) that hold one of <see cref="Pages"/>.</summary>
    public IReadOnlyList<string> Documents { get; init; } = [];
}
