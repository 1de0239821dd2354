namespace IndexKeeper.Core.Health;

/// <summary>The worst severity among the reasons (healthy when there are none) and the reasons themselves.</summary>
public sealed record HealthReport(HealthStatus Status, IReadOnlyList<HealthReason> Reasons);
