namespace IndexKeeper.Service.WorkQueue;

/// <summary>
/// The coordinator's view of the work queue for status, metrics, health and the plan: whether PostgreSQL
/// answers (and why not), jobs by state, what came back, and the workers by their heartbeats.
/// </summary>
/// <param name="Fault">Why PostgreSQL does not answer now; null while it does.</param>
/// <param name="FaultSinceUtc">Since when it does not.</param>
/// <param name="Expired">Claimed jobs whose lease has expired (their worker went silent); another worker takes them.</param>
/// <param name="Rejected">Results never committed since the coordinator started: another encoder id or bad bytes.</param>
/// <param name="Commits">Commits (each one fsync and one catalog transaction) that held the <paramref name="Committed"/> results.</param>
public sealed record WorkQueueFigures(
    string? Fault,
    DateTime? FaultSinceUtc,
    long Waiting,
    long Claimed,
    long Finished,
    long Expired,
    long Committed,
    long Rejected,
    long Commits,
    IReadOnlyList<WorkerFigures> Workers)
{
    /// <summary>Workers with a recent heartbeat.</summary>
    public int LiveWorkers => Workers.Count(w => w.Live);
}
