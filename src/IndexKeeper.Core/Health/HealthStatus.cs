namespace IndexKeeper.Core.Health;

/// <summary>The daemon's answer at <c>/health</c>; ordered by severity.</summary>
public enum HealthStatus
{
    Healthy = 0,
    Degraded = 1,
    Unhealthy = 2,
}
