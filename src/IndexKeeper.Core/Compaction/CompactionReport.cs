namespace IndexKeeper.Core.Compaction;

/// <summary>What one compaction run did: jobs, segments rewritten, bytes read, written and reclaimed; and the page-word files.</summary>
public sealed record CompactionReport(int Jobs, int SegmentsRewritten, long BytesRead, long BytesWritten, long BytesReclaimed)
{
    /// <summary>The page-word files compacted in the same run (docs/compaction.md, "Page-word files").</summary>
    public WordCompactionReport Words { get; init; } = WordCompactionReport.None;
}
