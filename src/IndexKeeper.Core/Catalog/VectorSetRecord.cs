namespace IndexKeeper.Core.Catalog;

/// <summary>
/// Where the vector set of one page key under one encoder lives (collection <c>vectorSets</c>). Live while
/// a live document holds the page key; a dead one stays until compaction drops its bytes.
/// </summary>
public sealed class VectorSetRecord
{
    /// <summary>Encoder id, '/', page key.</summary>
    public string Id { get; set; } = string.Empty;

    public string EncoderId { get; set; } = string.Empty;

    public string PageKey { get; set; } = string.Empty;

    public long SegmentId { get; set; }

    public long Offset { get; set; }

    public int Length { get; set; }

    /// <summary>The record's CRC-32C (stored widened: LiteDB has no unsigned 32-bit type).</summary>
    public long Checksum { get; set; }

    public int VectorCount { get; set; }

    public bool Live { get; set; }

    public static string MakeId(string encoderId, string pageKey) => encoderId + "/" + pageKey;
}
