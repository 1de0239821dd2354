namespace IndexKeeper.Core.Compaction;

/// <summary>
/// What the compaction policy knows of one segment, as the catalog counts it.
/// </summary>
/// <param name="Bytes">The file's length on disk.</param>
/// <param name="LiveBytes">Sum of the record lengths of the segment's live vector sets.</param>
/// <param name="Created">When the segment was created; orders jobs so older data is rewritten first.</param>
public sealed record SegmentStats(
    long SegmentId,
    string EncoderId,
    bool Sealed,
    long Bytes,
    long LiveBytes,
    long RecordCount,
    long LiveRecordCount,
    DateTimeOffset Created)
{
    /// <summary>The share of the file that no live vector set uses (headers and seals count as dead).</summary>
    public double DeadShare => Bytes <= 0 ? 0 : 1.0 - ((double)LiveBytes / Bytes);
}
