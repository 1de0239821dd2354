using IndexKeeper.Core.Faults;

namespace IndexKeeper.Tests.Crash;

/// <summary>
/// One row of the fault matrix: a command run with a fault armed at the Nth reach of a point, after an
/// optional prelude (a command stopped at another point, which leaves the state the fault's command meets).
/// </summary>
internal sealed record FaultScenario(string Command, string Point, string Action, int Nth = 1, FaultScenario? Prelude = null)
{
    public static readonly string[] Actions = ["exit", "enospc", "eio"];

    /// <summary>
    /// Points a <c>sync</c> reaches when its scan writes new page words and it embeds new pages into the open segment. Its seal is the same code as
    /// the seal <c>compact</c> makes of the open segment first, so the seal and directory points run there.
    /// </summary>
    private static readonly string[] SyncPoints =
    [
        FaultPoints.WordsAppendBeforeFsync, FaultPoints.WordsAppendAfterFsync,
        FaultPoints.SegmentAppendBeforeFsync, FaultPoints.SegmentAppendAfterFsync, FaultPoints.CatalogCommitBefore, FaultPoints.CatalogCommitAfter,
    ];

    /// <summary>Points of a <c>compact</c>: sealing the open segment, writing outputs, the swap, deleting the old files; then the page-word files' rewrite, commit and delete.</summary>
    private static readonly string[] CompactPoints =
    [
        FaultPoints.SegmentSealBefore, FaultPoints.CompactionOutputWrite, FaultPoints.SegmentSealAfterFsync, FaultPoints.SegmentRenameBefore,
        FaultPoints.SegmentRenameAfter, FaultPoints.SegmentSealAfter, FaultPoints.DirectoryFsyncBefore, FaultPoints.DirectoryFsyncAfter, FaultPoints.CatalogCommitBefore,
        FaultPoints.CompactionSwapBeforeCommit, FaultPoints.CompactionSwapAfterCommit, FaultPoints.CompactionDeleteBefore,
        FaultPoints.CompactionDeleteAfter, FaultPoints.WordsCompactionBeforeFsync, FaultPoints.WordsCompactionBeforeCommit,
        FaultPoints.WordsCompactionAfterCommit, FaultPoints.WordsCompactionDeleteBefore,
    ];

    /// <summary>Recovery points, each met by the <c>sync</c> after a prelude that leaves what it repairs.</summary>
    private static readonly (string Point, FaultScenario Prelude)[] RecoveryPoints =
    [
        (FaultPoints.RecoveryCutBefore, new("sync", FaultPoints.SegmentAppendAfterFsync, "exit")),
        (FaultPoints.RecoveryCutAfter, new("sync", FaultPoints.SegmentAppendAfterFsync, "exit")),
        (FaultPoints.RecoveryDeleteTemp, new("compact", FaultPoints.SegmentRenameBefore, "exit")),
        (FaultPoints.RecoverySetAside, new("compact", FaultPoints.CompactionSwapBeforeCommit, "exit")),
    ];

    /// <summary>The whole matrix, in the order of its document.</summary>
    public static IReadOnlyList<FaultScenario> All { get; } =
    [
        .. SyncPoints.SelectMany(p => Actions.Select(a => new FaultScenario("sync", p, a))),

        // The second batch's append: one batch is committed before the fault.
        .. Actions.Select(a => new FaultScenario("sync", FaultPoints.SegmentAppendAfterFsync, a, 2)),
        .. CompactPoints.SelectMany(p => Actions.Select(a => new FaultScenario("compact", p, a))),
        .. RecoveryPoints.SelectMany(r => Actions.Select(a => new FaultScenario("sync", r.Point, a, 1, r.Prelude))),
    ];

    public string Arming => $"{Point}:{Action}:{Nth}";

    public string Name => (Prelude is null ? "" : $"after {Prelude.Command} stopped at {Prelude.Point}, ") + $"{Command} {Arming}";
}
