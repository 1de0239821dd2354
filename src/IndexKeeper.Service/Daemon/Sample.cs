namespace IndexKeeper.Service.Daemon;

/// <summary>One point of the status page's chart.</summary>
public sealed record Sample(DateTimeOffset At, long Queued, double PagesPerSecond);
