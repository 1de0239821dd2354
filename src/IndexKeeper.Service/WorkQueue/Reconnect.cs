namespace IndexKeeper.Service.WorkQueue;

/// <summary>The wait before the next attempt to reach PostgreSQL: one second first, doubling, at most the setting Queue:ReconnectMaxSeconds.</summary>
internal static class Reconnect
{
    public static TimeSpan Next(TimeSpan previous, TimeSpan max) =>
        previous <= TimeSpan.Zero ? TimeSpan.FromSeconds(Math.Min(1, max.TotalSeconds)) : TimeSpan.FromTicks(Math.Min(previous.Ticks * 2, max.Ticks));
}
