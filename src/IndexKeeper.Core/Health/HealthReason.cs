namespace IndexKeeper.Core.Health;

/// <summary>One finding of <see cref="HealthRules"/>: a stable code for alerts, its severity, and words for people.</summary>
public sealed record HealthReason(string Code, HealthStatus Severity, string Message);
