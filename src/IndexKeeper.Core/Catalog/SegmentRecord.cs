namespace IndexKeeper.Core.Catalog;

/// <summary>One segment file as the catalog counts it (collection <c>segments</c>).</summary>
public sealed class SegmentRecord
{
    /// <summary>Segment id; the file is <c>segments/seg-NNNNNN.vec</c> (docs/segment-format.md).</summary>
    public long Id { get; set; }

    public string EncoderId { get; set; } = string.Empty;

    public int Dimensions { get; set; }

    public bool Sealed { get; set; }

    /// <summary>Committed length: bytes past it in an open segment were never committed and are cut at open.</summary>
    public long Length { get; set; }

    public long LiveBytes { get; set; }

    public long RecordCount { get; set; }

    public long LiveRecordCount { get; set; }

    public DateTime CreatedUtc { get; set; }
}
