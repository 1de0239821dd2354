namespace IndexKeeper.Core.Compaction;

/// <summary>What one compaction run did: jobs, segments rewritten, bytes read, written and reclaimed.</summary>
public sealed record CompactionReport(int Jobs, int SegmentsRewritten, long BytesRead, long BytesWritten, long BytesReclaimed);
