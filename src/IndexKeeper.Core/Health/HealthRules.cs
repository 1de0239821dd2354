using System.Globalization;

namespace IndexKeeper.Core.Health;

/// <summary>
/// Decides the daemon's health from a snapshot of figures. Pure: plain data in, plain data out. Each rule
/// adds at most one reason; the status is the worst severity found. Unhealthy (HTTP 503) is kept for
/// states in which the index stops following its store or stops serving: the work loop died, the disk is
/// about to fill, or searches fail.
/// </summary>
public static class HealthRules
{
    /// <summary>
    /// Every code a rule can give. Metrics expose one series per code (0 while the reason is absent), so an
    /// alert or a dashboard sees each code before it first occurs; a test keeps this list and the rules in step.
    /// </summary>
    public static IReadOnlyList<string> Codes { get; } =
    [
        "work-loop-stopped", "work-loop-retrying", "search-failing", "index-damaged", "disk-critical", "disk-low", "root-missing",
        "watcher-lost", "full-walk-overdue", "backlog-past-window", "migration-running", "canary-drift", "dead-ratio-high", "quarantine-growing",
        "candidate-recall-low",
    ];

    public static HealthReport Evaluate(HealthSnapshot snapshot, HealthLimits limits)
    {
        ArgumentNullException.ThrowIfNull(snapshot);
        ArgumentNullException.ThrowIfNull(limits);
        var c = CultureInfo.InvariantCulture;
        var reasons = new List<HealthReason>();
        if (!snapshot.WorkLoopRunning)
        {
            reasons.Add(new("work-loop-stopped", HealthStatus.Unhealthy, "the loop that scans and embeds has stopped; see the log"));
        }

        if (snapshot.WorkLoopFault is { } fault)
        {
            reasons.Add(new("work-loop-retrying", HealthStatus.Degraded, $"the loop that scans and embeds hit a fault and tries again after a back-off: {fault}"));
        }

        if (snapshot.WorkQueueFault is { } queueFault)
        {
            reasons.Add(new("work-queue-unreachable", HealthStatus.Degraded, $"the work queue's PostgreSQL does not answer ({queueFault}); workers get no jobs, the coordinator reconnects with backoff"));
        }

        if (snapshot.SearchFailureAge is { } failedAgo && failedAgo < limits.SearchFailureWindow)
        {
            var reason = snapshot.SearchFailure ?? "no reason given";
            reasons.Add(snapshot.SearchSucceededSince
                ? new("search-failing", HealthStatus.Degraded, string.Create(c, $"a search failed {failedAgo.TotalMinutes:0} min ago ({reason}); searches since have succeeded"))
                : new("search-failing", HealthStatus.Unhealthy, string.Create(c, $"searches fail: the last one {failedAgo.TotalMinutes:0} min ago: {reason}")));
        }

        if (snapshot.Damage is { } damage)
        {
            reasons.Add(new("index-damaged", HealthStatus.Degraded, $"{damage}; searches answer from the rest; run `indexkeeper verify`, then docs/recovery.md"));
        }

        if (snapshot.FreeShare is { } free)
        {
            if (free < limits.MinFreeShare / 2)
            {
                reasons.Add(new("disk-critical", HealthStatus.Unhealthy, string.Create(c, $"the index volume has {free:P1} free; segments cannot be written much longer")));
            }
            else if (free < limits.MinFreeShare)
            {
                reasons.Add(new("disk-low", HealthStatus.Degraded, string.Create(c, $"the index volume has {free:P1} free (limit {limits.MinFreeShare:P0})")));
            }
        }

        if (snapshot.RootsMissing.Count > 0)
        {
            reasons.Add(new("root-missing", HealthStatus.Degraded, $"root(s) not found, documents kept for their grace time: {string.Join(", ", snapshot.RootsMissing)}"));
        }

        if (snapshot.WatchersLost.Count > 0)
        {
            reasons.Add(new("watcher-lost", HealthStatus.Degraded, $"no change notifications for: {string.Join(", ", snapshot.WatchersLost)}; only full walks catch changes there"));
        }

        var overdueAfter = limits.FullWalkInterval * 2;
        if (snapshot.LastFullWalkAge is { } age ? age > overdueAfter : snapshot.Uptime > overdueAfter)
        {
            reasons.Add(new("full-walk-overdue", HealthStatus.Degraded, snapshot.LastFullWalkAge is { } a
                ? string.Create(c, $"the last full walk finished {a.TotalMinutes:0} min ago (due every {limits.FullWalkInterval.TotalMinutes:0} min)")
                : string.Create(c, $"no full walk has finished in {snapshot.Uptime.TotalMinutes:0} min")));
        }

        if (snapshot.BacklogFinish is { } finish && snapshot.WindowEnd is { } end && finish > end)
        {
            reasons.Add(new("backlog-past-window", HealthStatus.Degraded, string.Create(c, $"queued work is expected to finish at {finish:O}, after the window ends at {end:O}")));
        }

        if (snapshot.MigrationQueued > 0)
        {
            reasons.Add(new("migration-running", HealthStatus.Degraded, string.Create(c, $"{snapshot.MigrationQueued} page(s) wait to move to the active encoder; searches rank with the previous encoder until the switch-over")));
        }

        if (snapshot.CanaryDrift is { } canaries)
        {
            reasons.Add(new("canary-drift", HealthStatus.Degraded, $"re-embedded canary pages no longer match their stored vectors ({canaries}); the encoder's outputs changed under the same id"));
        }

        if (snapshot.DeadRatio > limits.DeadRatio)
        {
            reasons.Add(new("dead-ratio-high", HealthStatus.Degraded, string.Create(c, $"{snapshot.DeadRatio:P0} of segment bytes are dead (limit {limits.DeadRatio:P0}); compaction is behind")));
        }

        if (snapshot.QuarantinedEarlier is { } earlier && snapshot.Quarantined > earlier)
        {
            reasons.Add(new("quarantine-growing", HealthStatus.Degraded, string.Create(c, $"quarantine grew from {earlier} to {snapshot.Quarantined} in the last hour")));
        }

        if (snapshot.CandidateRecall is { } recall && recall < limits.MinimumCandidateRecall)
        {
            reasons.Add(new("candidate-recall-low", HealthStatus.Degraded, string.Create(c, $"searches find {recall:0.000} of the exhaustive top-10 on sample queries (limit {limits.MinimumCandidateRecall:0.00}); retraining its centroids is planned work in the windows (plan shows it; docs/search.md, \"Retraining\")")));
        }

        var status = reasons.Count == 0 ? HealthStatus.Healthy : reasons.Max(r => r.Severity);
        return new HealthReport(status, reasons);
    }
}
