namespace IndexKeeper.Core.Storage;

/// <summary>
/// The result of walking every record of a segment. Records after a damaged one are not listed: the
/// walk cannot trust a frame past damage, but each of them stays readable at its catalog location.
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
    long? DamageOffset);
