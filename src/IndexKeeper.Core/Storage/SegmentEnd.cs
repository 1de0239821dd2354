namespace IndexKeeper.Core.Storage;

/// <summary>How a scan of a segment ended.</summary>
public enum SegmentEnd
{
    /// <summary>Every byte is a good record and there is no seal: an open segment.</summary>
    Open,

    /// <summary>A good seal ends the file and the whole-file checksum matches.</summary>
    Sealed,

    /// <summary>
    /// The last record is incomplete (or the file ends in never-written zeros): what a crash during an
    /// append leaves. Everything before <see cref="SegmentScan.ValidLength"/> is good; recovery may cut there.
    /// </summary>
    TornTail,

    /// <summary>A complete record (or the seal) fails its checksum or breaks the format; see <see cref="SegmentScan.Problem"/>.</summary>
    Damaged,
}
