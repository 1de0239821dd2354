using IndexKeeper.Core.Search;

namespace IndexKeeper.Service.Daemon;

/// <summary>The work loop's last look at retraining the serving view (docs/search.md, "Retraining").</summary>
/// <param name="Facts">The view's figures it was taken on.</param>
/// <param name="Decision">Whether retraining is due, and why.</param>
/// <param name="RunsAt">When it will run within the windows (now: it is running or has just run); null when not due or no window is long enough.</param>
/// <param name="EstimatedSeconds">CPU seconds the build is expected to take.</param>
public sealed record RetrainingStatus(RetrainingFacts Facts, RetrainingDecision Decision, DateTimeOffset? RunsAt, double EstimatedSeconds);
