namespace IndexKeeper.Core.Storage;

/// <summary>What sealing produced: the immutable file, its length, how many vector sets it holds, and its whole-file checksum.</summary>
public sealed record SealedSegment(long SegmentId, string Path, long Length, long RecordCount, uint FileChecksum);
