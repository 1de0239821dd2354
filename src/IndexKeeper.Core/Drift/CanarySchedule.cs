namespace IndexKeeper.Core.Drift;

/// <summary>When the next canary check is due (pure; the daemon asks it with its clock and the encoder record's last check).</summary>
public static class CanarySchedule
{
    /// <summary>Due when never checked, when the interval has passed, or when the last check lies in the future (a clock set back).</summary>
    public static bool IsDue(DateTime? lastCheckedUtc, TimeSpan interval, DateTime nowUtc)
    {
        ArgumentOutOfRangeException.ThrowIfLessThanOrEqual(interval, TimeSpan.Zero);
        return lastCheckedUtc is not { } last || last > nowUtc || nowUtc - last >= interval;
    }
}
