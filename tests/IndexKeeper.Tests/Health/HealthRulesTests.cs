using IndexKeeper.Core.Health;

namespace IndexKeeper.Tests.Health;

/// <summary>
/// The health rules as a pure function: every rule alone at and around its threshold, and every
/// combination of the rules' findings (2^n snapshots) giving the worst severity and exactly their codes.
/// </summary>
public sealed class HealthRulesTests
{
    private static readonly HealthLimits Limits = new(TimeSpan.FromMinutes(60), DeadRatio: 0.5, MinFreeShare: 0.1, SearchFailureWindow: TimeSpan.FromMinutes(15));
    private static readonly DateTimeOffset Now = new(2026, 3, 29, 12, 0, 0, TimeSpan.Zero);

    private static readonly HealthSnapshot Calm = new(
        WorkLoopRunning: true,
        Uptime: TimeSpan.FromHours(5),
        RootsMissing: [],
        WatchersLost: [],
        LastFullWalkAge: TimeSpan.FromMinutes(30),
        BacklogFinish: Now.AddHours(1),
        WindowEnd: Now.AddHours(2),
        MigrationQueued: 0,
        DeadRatio: 0.1,
        FreeShare: 0.5,
        Quarantined: 3,
        QuarantinedEarlier: 3,
        CanaryDrift: null);

    /// <summary>Each rule: a snapshot that trips it alone, its code and severity.</summary>
    private static readonly (string Code, HealthStatus Severity, Func<HealthSnapshot, HealthSnapshot> Trip)[] Rules =
    [
        ("work-loop-stopped", HealthStatus.Unhealthy, s => s with { WorkLoopRunning = false }),
        ("disk-critical", HealthStatus.Unhealthy, s => s with { FreeShare = 0.04 }),
        ("root-missing", HealthStatus.Degraded, s => s with { RootsMissing = ["drawings"] }),
        ("watcher-lost", HealthStatus.Degraded, s => s with { WatchersLost = ["scans"] }),
        ("full-walk-overdue", HealthStatus.Degraded, s => s with { LastFullWalkAge = TimeSpan.FromMinutes(121) }),
        ("backlog-past-window", HealthStatus.Degraded, s => s with { BacklogFinish = Now.AddHours(3) }),
        ("migration-running", HealthStatus.Degraded, s => s with { MigrationQueued = 1 }),
        ("dead-ratio-high", HealthStatus.Degraded, s => s with { DeadRatio = 0.51 }),
        ("quarantine-growing", HealthStatus.Degraded, s => s with { Quarantined = 4 }),
        ("canary-drift", HealthStatus.Degraded, s => s with { CanaryDrift = "mean cosine 0.912, minimum 0.4 over 16 pages" }),
        ("work-loop-retrying", HealthStatus.Degraded, s => s with { WorkLoopFault = "No space left on device (retry 2 of 20 at 12:00:04Z)" }),
        ("search-failing", HealthStatus.Unhealthy, s => s with { SearchFailureAge = TimeSpan.FromMinutes(1), SearchFailure = "a segment record failed its checksum" }),
        ("candidate-recall-low", HealthStatus.Degraded, s => s with { CandidateRecall = 0.94 }),
    ];

    /// <summary>Metrics publish one series per listed code: a rule whose code is missing there would never reach an alert.</summary>
    [Fact]
    public void TheListOfCodesHoldsExactlyTheCodesTheRulesGive()
    {
        // disk-low and index-damaged are tripped by the theories below (disk thresholds, damage text).
        var given = Rules.Select(r => r.Code).Append("disk-low").Append("index-damaged").Distinct().Order(StringComparer.Ordinal);
        Assert.Equal(given, HealthRules.Codes.Order(StringComparer.Ordinal));
        Assert.Equal("disk-low", Assert.Single(HealthRules.Evaluate(Calm with { FreeShare = 0.09 }, Limits).Reasons).Code);
        Assert.Equal("index-damaged", Assert.Single(HealthRules.Evaluate(Calm with { Damage = "1 segment file(s) missing" }, Limits).Reasons).Code);
    }

    [Theory]
    [InlineData(0.95, false)]
    [InlineData(1.0, false)]
    [InlineData(0.9499, true)]
    public void ARecallFigureBelowTheLimitIsReported(double recall, bool reported) =>
        Assert.Equal(reported, HealthRules.Evaluate(Calm with { CandidateRecall = recall }, Limits).Reasons.Any(r => r.Code == "candidate-recall-low"));

    [Fact]
    public void ACalmSnapshotIsHealthyWithoutReasons()
    {
        var report = HealthRules.Evaluate(Calm, Limits);
        Assert.Equal(HealthStatus.Healthy, report.Status);
        Assert.Empty(report.Reasons);
    }

    [Fact]
    public void EveryCombinationOfFindingsGivesTheWorstSeverityAndExactlyTheirCodes()
    {
        for (var mask = 0; mask < 1 << Rules.Length; mask++)
        {
            var snapshot = Calm;
            var expected = new List<string>();
            var worst = HealthStatus.Healthy;
            for (var i = 0; i < Rules.Length; i++)
            {
                if ((mask & (1 << i)) != 0)
                {
                    snapshot = Rules[i].Trip(snapshot);
                    expected.Add(Rules[i].Code);
                    worst = (HealthStatus)Math.Max((int)worst, (int)Rules[i].Severity);
                }
            }

            var report = HealthRules.Evaluate(snapshot, Limits);
            Assert.Equal(expected.Order(StringComparer.Ordinal), report.Reasons.Select(r => r.Code).Order(StringComparer.Ordinal));
            Assert.Equal(worst, report.Status);
            Assert.All(report.Reasons, r => Assert.False(string.IsNullOrWhiteSpace(r.Message)));
        }
    }

    [Theory]
    [InlineData(0.10, null)]
    [InlineData(0.0999, "disk-low")]
    [InlineData(0.05, "disk-low")]
    [InlineData(0.0499, "disk-critical")]
    [InlineData(0.0, "disk-critical")]
    public void FreeSpaceThresholds(double free, string? code)
    {
        var report = HealthRules.Evaluate(Calm with { FreeShare = free }, Limits);
        Assert.Equal(code is null ? [] : new[] { code }, report.Reasons.Select(r => r.Code));
        Assert.Equal(code switch { null => HealthStatus.Healthy, "disk-low" => HealthStatus.Degraded, _ => HealthStatus.Unhealthy }, report.Status);
    }

    [Fact]
    public void UnknownFreeSpaceIsNoFinding() => Assert.Empty(HealthRules.Evaluate(Calm with { FreeShare = null }, Limits).Reasons);

    [Theory]
    [InlineData(120, false)]
    [InlineData(120.01, true)]
    public void AFullWalkIsOverdueAfterTwiceItsInterval(double minutes, bool overdue) =>
        Assert.Equal(overdue, HealthRules.Evaluate(Calm with { LastFullWalkAge = TimeSpan.FromMinutes(minutes) }, Limits).Reasons.Any(r => r.Code == "full-walk-overdue"));

    [Theory]
    [InlineData(60, false)]
    [InlineData(121, true)]
    public void WithoutAFinishedWalkUptimeDecides(double uptimeMinutes, bool overdue) =>
        Assert.Equal(overdue, HealthRules.Evaluate(Calm with { LastFullWalkAge = null, Uptime = TimeSpan.FromMinutes(uptimeMinutes) }, Limits).Reasons.Any(r => r.Code == "full-walk-overdue"));

    [Theory]
    [InlineData(0.5, false)]
    [InlineData(0.5001, true)]
    public void DeadRatioAboveTheLimit(double ratio, bool reported) =>
        Assert.Equal(reported, HealthRules.Evaluate(Calm with { DeadRatio = ratio }, Limits).Reasons.Any(r => r.Code == "dead-ratio-high"));

    [Fact]
    public void BacklogRuleNeedsBothAFinishAndAWindowEnd()
    {
        Assert.Empty(HealthRules.Evaluate(Calm with { BacklogFinish = Now.AddDays(9), WindowEnd = null }, Limits).Reasons);
        Assert.Empty(HealthRules.Evaluate(Calm with { BacklogFinish = null }, Limits).Reasons);
        Assert.Empty(HealthRules.Evaluate(Calm with { BacklogFinish = Now.AddHours(2) }, Limits).Reasons);
    }

    [Fact]
    public void QuarantineThatShrankOrHasNoHistoryIsNoFinding()
    {
        Assert.Empty(HealthRules.Evaluate(Calm with { Quarantined = 1 }, Limits).Reasons);
        Assert.Empty(HealthRules.Evaluate(Calm with { Quarantined = 50, QuarantinedEarlier = null }, Limits).Reasons);
    }

    [Theory]
    [InlineData(0, false, "search-failing", HealthStatus.Unhealthy)]
    [InlineData(14.99, false, "search-failing", HealthStatus.Unhealthy)]
    [InlineData(14.99, true, "search-failing", HealthStatus.Degraded)]
    [InlineData(15, false, null, HealthStatus.Healthy)]
    [InlineData(60, true, null, HealthStatus.Healthy)]
    public void AFailedSearchIsReportedForItsWindowAndLessSoOnceOneSucceeded(double minutesAgo, bool succeededSince, string? code, HealthStatus status)
    {
        var report = HealthRules.Evaluate(Calm with { SearchFailureAge = TimeSpan.FromMinutes(minutesAgo), SearchFailure = "catalog read failed", SearchSucceededSince = succeededSince }, Limits);
        Assert.Equal(code is null ? [] : new[] { code }, report.Reasons.Select(r => r.Code));
        Assert.Equal(status, report.Status);
        Assert.All(report.Reasons, r => Assert.Contains("catalog read failed", r.Message, StringComparison.Ordinal));
    }

    [Fact]
    public void NoFailedSearchIsNoFinding() =>
        Assert.Empty(HealthRules.Evaluate(Calm with { SearchFailureAge = null, SearchSucceededSince = true }, Limits).Reasons);
}
