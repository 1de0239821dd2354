namespace IndexKeeper.Core.Storage;

/// <summary>
/// The result of walking every record of a segment. <see cref="Records"/> ends at the first damage: what
/// lies past it is not trusted for cutting or sealing. The good records found past the damage by
/// resynchronising on 8-byte boundaries are listed apart in <see cref="RecordsAfterDamage"/>, for the
/// catalog rebuild; each of them is proven by its own frame and record checksums.
/// </summary>
/// <param name="ValidLength">Bytes from the start that are header and good records (and the seal, when sealed).</param>
/// <param name="DamageOffset">Offset of the bad record when <see cref="End"/> is <see cref="SegmentEnd.Damaged"/>.</param>
public sealed record SegmentScan(
    SegmentHeader Header,
    IReadOnlyList<ScannedRecord> Records,
    SegmentEnd End,
    long ValidLength,
    long FileLength,
    string? Problem,
    long? DamageOffset,
    IReadOnlyList<ScannedRecord> RecordsAfterDamage);
