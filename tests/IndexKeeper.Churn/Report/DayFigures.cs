namespace IndexKeeper.Churn.Report;

/// <summary>One simulated day: what changed, the truth, and the three strategies side by side.</summary>
internal sealed record DayFigures(
    int Day,
    string DayType,
    IReadOnlyDictionary<string, int> Changes,
    int Files,
    long Pages,
    long DistinctContents,
    long NewContents,
    StrategyDay FullReembed,
    StrategyDay FileHashing,
    StrategyDay IndexKeeper,
    long IndexKeeperUnserved,
    long IndexKeeperSplitContents,
    long IndexKeeperLiveBytes,
    long IndexKeeperSegmentBytes,
    double IndexKeeperSpaceAmplification,
    double IndexKeeperScanSeconds,
    double IndexKeeperSyncSeconds,
    long IndexKeeperFilesRead,
    long IndexKeeperPagesReused);
