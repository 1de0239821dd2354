namespace IndexKeeper.Core.Compaction;

/// <summary>
/// What the word-file policy knows of one page-word file: its length on disk and the bytes and records the
/// catalog's page records still name in it.
/// </summary>
public sealed record WordFileStats(long FileId, long FileBytes, long LiveBytes, int LiveRecords)
{
    /// <summary>Bytes of the file no page record names (its header counts as live while any record is).</summary>
    public long DeadBytes => LiveRecords == 0 ? FileBytes : Math.Max(0, FileBytes - WordFilePolicy.HeaderBytes - LiveBytes);
}
