namespace IndexKeeper.Core.Health;

/// <summary>The figures the health rules look at, sampled by the daemon at one moment.</summary>
/// <param name="WorkLoopRunning">False once the loop that scans and embeds has stopped on an error.</param>
/// <param name="Uptime">Time since the daemon started (a first full walk is not overdue before it had time).</param>
/// <param name="LastFullWalkAge">Time since the last completed full walk of every root; null when none completed yet.</param>
/// <param name="BacklogFinish">When queued work is expected to be done under the windows and budget; null when unknown or nothing is queued.</param>
/// <param name="WindowEnd">The end of the current or next window; null when no windows are configured.</param>
/// <param name="FreeShare">Free share of the index volume; null when it could not be read.</param>
/// <param name="QuarantinedEarlier">Quarantined documents and pages an hour ago (null when the daemon is younger).</param>
/// <param name="CanaryDrift">The figures of the last canary check when it found silent drift; null when it found none or none ran.</param>
/// <param name="WorkLoopFault">The fault the work loop is backing off from before it tries again; null when its last turn succeeded.</param>
/// <param name="SearchFailureAge">Time since the last search that failed; null when none failed.</param>
/// <param name="SearchFailure">Why the last failed search failed.</param>
/// <param name="Damage">Missing segment files, unreadable vector sets and pages without vectors, in words; null when none.</param>
/// <param name="WorkQueueFault">Why the work queue's PostgreSQL does not answer; null when it does or none is configured.</param>
/// <param name="SearchSucceededSince">True when a search succeeded after the last one that failed.</param>
/// <param name="CandidateRecall">The last recall figure of the serving view's candidates (share of the exhaustive top-10); null when none.</param>
public sealed record HealthSnapshot(
    bool WorkLoopRunning,
    TimeSpan Uptime,
    IReadOnlyList<string> RootsMissing,
    IReadOnlyList<string> WatchersLost,
    TimeSpan? LastFullWalkAge,
    DateTimeOffset? BacklogFinish,
    DateTimeOffset? WindowEnd,
    long MigrationQueued,
    double DeadRatio,
    double? FreeShare,
    long Quarantined,
    long? QuarantinedEarlier,
    string? CanaryDrift = null,
    string? WorkLoopFault = null,
    TimeSpan? SearchFailureAge = null,
    string? SearchFailure = null,
    bool SearchSucceededSince = false,
    string? Damage = null,
    string? WorkQueueFault = null,
    double? CandidateRecall = null);
