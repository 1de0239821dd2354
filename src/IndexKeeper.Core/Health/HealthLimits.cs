namespace IndexKeeper.Core.Health;

/// <summary>The thresholds the health rules compare figures with (from the daemon's settings).</summary>
/// <param name="FullWalkInterval">How often the daemon walks every root; a walk older than twice this is overdue.</param>
/// <param name="DeadRatio">A dead share of segment bytes above this is reported.</param>
/// <param name="MinFreeShare">Free space below this share is degraded, below half of it unhealthy.</param>
/// <param name="SearchFailureWindow">A search that failed less than this long ago is reported.</param>
/// <param name="MinimumCandidateRecall">A recall figure of the serving view's candidates below this is reported
/// (docs/search.md, "Recall": 0.95 of the exhaustive top-10).</param>
public sealed record HealthLimits(TimeSpan FullWalkInterval, double DeadRatio, double MinFreeShare, TimeSpan SearchFailureWindow, double MinimumCandidateRecall = 0.95);
