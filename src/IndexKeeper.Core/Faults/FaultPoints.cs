namespace IndexKeeper.Core.Faults;

/// <summary>
/// The named I/O points of the write path where a crash test can stop or fail the process
/// (<see cref="FaultInjection"/>, docs/fault-matrix.md). Names are our own; a test reads <see cref="All"/>
/// and fails if any point was never reached, so a point added here must be reachable by a command.
/// </summary>
internal static class FaultPoints
{
    /// <summary>An embed batch is appended (in the writer's buffer or the page cache), not yet fsynced: nothing of it is committed.</summary>
    public const string SegmentAppendBeforeFsync = "segment.append.before-fsync";

    /// <summary>The batch's bytes are durable, the catalog commit that references them has not run: an uncommitted tail.</summary>
    public const string SegmentAppendAfterFsync = "segment.append.after-fsync";

    /// <summary>Before the seal record is written: the segment is still open.</summary>
    public const string SegmentSealBefore = "segment.seal.before";

    /// <summary>The seal record is written and fsynced; the file is not yet read-only, renamed or recorded as sealed.</summary>
    public const string SegmentSealAfterFsync = "segment.seal.after-fsync";

    /// <summary>A sealed compaction output still has its temp name.</summary>
    public const string SegmentRenameBefore = "segment.rename.before";

    /// <summary>A compaction output has its real name, the directory is not yet fsynced.</summary>
    public const string SegmentRenameAfter = "segment.rename.after";

    /// <summary>The seal is durable with its directory entry; the catalog does not yet record the segment as sealed.</summary>
    public const string SegmentSealAfter = "segment.seal.after";

    /// <summary>A compaction copies a record into its temp-named output (before the write).</summary>
    public const string CompactionOutputWrite = "compaction.output.write";

    /// <summary>Before a directory is fsynced (after a segment is created, sealed or renamed).</summary>
    public const string DirectoryFsyncBefore = "directory.fsync.before";

    /// <summary>After a directory is fsynced.</summary>
    public const string DirectoryFsyncAfter = "directory.fsync.after";

    /// <summary>A catalog transaction is complete but not committed (the one transaction helper, every kind of edit).</summary>
    public const string CatalogCommitBefore = "catalog.commit.before";

    /// <summary>A catalog transaction has committed; the caller has not yet seen it return.</summary>
    public const string CatalogCommitAfter = "catalog.commit.after";

    /// <summary>Compaction outputs are sealed under their real names; the swap's catalog transaction has not run.</summary>
    public const string CompactionSwapBeforeCommit = "compaction.swap.before-commit";

    /// <summary>The swap is committed; the old segments are not yet retired.</summary>
    public const string CompactionSwapAfterCommit = "compaction.swap.after-commit";

    /// <summary>An old segment no reader holds is about to be deleted after a committed swap.</summary>
    public const string CompactionDeleteBefore = "compaction.delete.before";

    /// <summary>An old segment was deleted.</summary>
    public const string CompactionDeleteAfter = "compaction.delete.after";

    /// <summary>A scan batch's new page words are written to the page-word store, not yet fsynced; the catalog does not name them.</summary>
    public const string WordsAppendBeforeFsync = "words.append.before-fsync";

    /// <summary>The page words are durable; the catalog commit that names them (the scan batch) has not run.</summary>
    public const string WordsAppendAfterFsync = "words.append.after-fsync";

    /// <summary>A page-word file's live records are copied into a new file, not yet fsynced; nothing names the new file.</summary>
    public const string WordsCompactionBeforeFsync = "words.compaction.before-fsync";

    /// <summary>The new page-word file is durable with its directory entry; the catalog commit that moves the pages' words to it has not run.</summary>
    public const string WordsCompactionBeforeCommit = "words.compaction.before-commit";

    /// <summary>The pages' words are moved in the catalog; the old page-word file is not yet deleted.</summary>
    public const string WordsCompactionAfterCommit = "words.compaction.after-commit";

    /// <summary>A page-word file the catalog no longer names is about to be deleted.</summary>
    public const string WordsCompactionDeleteBefore = "words.compaction.delete-before";

    /// <summary>Recovery (at open, or after a failed append) is about to cut an open segment to its committed length.</summary>
    public const string RecoveryCutBefore = "recovery.cut.before";

    /// <summary>Recovery cut an open segment and fsynced it.</summary>
    public const string RecoveryCutAfter = "recovery.cut.after";

    /// <summary>Recovery at open is about to delete an unfinished compaction output (a temp file).</summary>
    public const string RecoveryDeleteTemp = "recovery.delete-temp";

    /// <summary>Recovery at open is about to set a segment no catalog commit references aside in <c>segments/orphaned/</c>.</summary>
    public const string RecoverySetAside = "recovery.set-aside";

    /// <summary>
    /// A new catalog is whole under its temporary name and is about to be renamed to <c>catalog.db</c>. Not in
    /// <see cref="All"/>: the matrix starts from an existing index, so this point has tests of its own
    /// (a reader beside the first sync, a leftover of a creation that stopped here; ReadersBesideWriterTests).
    /// </summary>
    public const string CatalogCreateRename = "catalog.create.rename";

    /// <summary>A remote worker's claim is committed in PostgreSQL; it has not read or encoded the pages (docs/work-queue.md, "Faults").</summary>
    public const string WorkerClaimAfter = "worker.claim.after";

    /// <summary>The coordinator committed handed-back vector sets to the catalog; their jobs are not yet deleted from PostgreSQL.</summary>
    public const string QueueCommitAfter = "queue.commit.after";

    /// <summary>Every point, in the order of the write path.</summary>
    public static IReadOnlyList<string> All { get; } =
    [
        SegmentAppendBeforeFsync, SegmentAppendAfterFsync, SegmentSealBefore, SegmentSealAfterFsync, SegmentRenameBefore,
        SegmentRenameAfter, SegmentSealAfter, CompactionOutputWrite, DirectoryFsyncBefore, DirectoryFsyncAfter,
        CatalogCommitBefore, CatalogCommitAfter, CompactionSwapBeforeCommit, CompactionSwapAfterCommit,
        CompactionDeleteBefore, CompactionDeleteAfter, WordsAppendBeforeFsync, WordsAppendAfterFsync,
        WordsCompactionBeforeFsync, WordsCompactionBeforeCommit, WordsCompactionAfterCommit, WordsCompactionDeleteBefore, RecoveryCutBefore, RecoveryCutAfter, RecoveryDeleteTemp, RecoverySetAside,
    ];

    /// <summary>
    /// Points with tests of their own instead of rows of the matrix (each says which): the work queue's need
    /// PostgreSQL, and the work-queue tests reach them.
    /// </summary>
    public static IReadOnlyList<string> OutsideMatrix { get; } = [CatalogCreateRename, WorkerClaimAfter, QueueCommitAfter];
}
