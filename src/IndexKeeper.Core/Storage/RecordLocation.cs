namespace IndexKeeper.Core.Storage;

/// <summary>
/// Where one vector-set record lives, as the catalog stores it: the segment, the byte offset of the
/// record's frame, the whole record's length (frame included) and the record checksum from its frame.
/// Reading at a location checks all four against the file.
/// </summary>
public readonly record struct RecordLocation(long SegmentId, long Offset, int Length, uint Checksum);
