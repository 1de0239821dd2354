namespace IndexKeeper.Core.Compaction;

/// <summary>
/// Which page-word files compaction rewrites (docs/compaction.md, "Page-word files"): a file whose dead
/// share reaches the segments' threshold is rewritten with only its live records; a file no page record
/// names is deleted without a copy. The file a writer appends to now is never picked. Pure.
/// </summary>
public static class WordFilePolicy
{
    /// <summary>The header of a page-word file (docs/page-words-format.md).</summary>
    public const long HeaderBytes = 16;

    public static IReadOnlyList<WordFileStats> Plan(IReadOnlyList<WordFileStats> files, CompactionOptions options, long? openFileId)
    {
        ArgumentNullException.ThrowIfNull(files);
        ArgumentNullException.ThrowIfNull(options);
        options.ThrowIfInvalid();
        return files
            .Where(f => f.FileId != openFileId && f.FileBytes > 0)
            .Where(f => f.LiveRecords == 0 || (double)f.DeadBytes / f.FileBytes >= options.DeadShareThreshold)
            .OrderBy(f => f.FileId)
            .ToList();
    }
}
