namespace IndexKeeper.Core.Scheduling;

/// <summary>
/// One parsed window entry: the ISO 8601 week days it starts on (bit 1 = Monday … bit 7 = Sunday) and its
/// local start and end as minutes after the start day's midnight (end past 1440 crosses midnight).
/// </summary>
internal sealed record WindowRule(int DayMask, int StartMinute, int EndMinute)
{
    public bool StartsOn(DayOfWeek day) => (DayMask & (1 << IsoDay(day))) != 0;

    /// <summary>ISO 8601 numbers Monday 1 to Sunday 7; .NET numbers Sunday 0.</summary>
    public static int IsoDay(DayOfWeek day) => day == DayOfWeek.Sunday ? 7 : (int)day;
}
