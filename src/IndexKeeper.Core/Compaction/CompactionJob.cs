namespace IndexKeeper.Core.Compaction;

/// <summary>Segments of one encoder to rewrite together; their live vector sets go to new segments, then the old ones are retired.</summary>
/// <param name="InputBytes">Bytes on disk of the input segments.</param>
/// <param name="LiveBytes">Bytes the job will copy (its write cost).</param>
public sealed record CompactionJob(string EncoderId, IReadOnlyList<long> SegmentIds, CompactionReason Reason, long InputBytes, long LiveBytes)
{
    /// <summary>Bytes the job frees once the old segments are deleted (new headers and seals aside).</summary>
    public long ReclaimedBytes => InputBytes - LiveBytes;
}
