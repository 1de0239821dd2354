namespace IndexKeeper.Service.WorkQueue;

/// <summary>
/// One worker as its heartbeats describe it (table <c>workers</c>): its encoder, its pages and encoder
/// time so far, the leases it took over from workers that went silent, and whether it is live (a heartbeat
/// within three of its intervals).
/// </summary>
public sealed record WorkerFigures(
    string Worker,
    string Host,
    string EncoderId,
    string EncoderName,
    DateTime StartedUtc,
    DateTime HeartbeatUtc,
    long PagesDone,
    long PagesFailed,
    double EncoderSeconds,
    long LeasesTakenOver,
    bool Live)
{
    /// <summary>Pages per second of encoder time, 0 before the first page.</summary>
    public double PagesPerSecond => EncoderSeconds > 0 ? PagesDone / EncoderSeconds : 0;
}
