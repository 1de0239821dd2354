namespace IndexKeeper.Core.Index;

/// <summary>What <see cref="CatalogRebuilder"/> took back from the segment files.</summary>
public sealed class CatalogRebuild
{
    /// <summary>Where the old catalog was moved (kept, never deleted); null when there was none.</summary>
    public string? OldCatalogMovedTo { get; set; }

    public int SegmentsRestored { get; set; }

    public int VectorSetsRestored { get; set; }

    /// <summary>Records found twice (the same page key and encoder): the later one is kept, the earlier is dead bytes.</summary>
    public int DuplicateRecords { get; set; }

    /// <summary>Encoder ids found in segment headers, with d.</summary>
    public Dictionary<string, int> Encoders { get; } = new(StringComparer.Ordinal);

    /// <summary>Set-aside segment files (orphaned or damaged) moved back to the segments folder, each with where it was.</summary>
    public List<string> FilesTakenBack { get; } = [];

    /// <summary>Files or parts of files that could not be taken back, with the reason.</summary>
    public List<string> Problems { get; } = [];
}
