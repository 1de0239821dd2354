using IndexKeeper.Core.Scheduling;

namespace IndexKeeper.Core.Planning;

/// <summary>
/// When a retraining of the serving view may run (docs/search.md, "Retraining"): bulk work, so only inside the
/// windows, and only where the estimated cost fits before the window closes (as no encoder batch starts past a
/// window's end). Pure: the daemon runs it when this says now; <c>plan</c> shows the instant.
/// </summary>
public static class RetrainingSlot
{
    /// <summary>How far ahead a slot is looked for.</summary>
    public static readonly TimeSpan Horizon = TimeSpan.FromDays(14);

    /// <summary>
    /// The first instant at or after <paramref name="now"/> inside a window that stays open for
    /// <paramref name="seconds"/> more; null when no window within <see cref="Horizon"/> is long enough.
    /// </summary>
    public static DateTimeOffset? Next(WindowCalendar calendar, DateTimeOffset now, double seconds)
    {
        ArgumentNullException.ThrowIfNull(calendar);
        ArgumentOutOfRangeException.ThrowIfNegative(seconds);
        var length = TimeSpan.FromSeconds(seconds);
        foreach (var (start, end) in calendar.OpenSpans(now, now + Horizon))
        {
            var from = start > now ? start : now;
            if (end - from >= length)
            {
                return from;
            }
        }

        return null;
    }
}
