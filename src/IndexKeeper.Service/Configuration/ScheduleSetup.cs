using IndexKeeper.Core.Scheduling;

namespace IndexKeeper.Service.Configuration;

/// <summary>Builds the time zone, window calendar and encoder gate from validated settings.</summary>
public static class ScheduleSetup
{
    /// <summary>The configured zone from the operating system's IANA database (/usr/share/zoneinfo on Linux), or the machine's.</summary>
    public static TimeZoneInfo Zone(ScheduleOptions options)
    {
        ArgumentNullException.ThrowIfNull(options);
        return string.IsNullOrWhiteSpace(options.TimeZone) ? TimeZoneInfo.Local : TimeZoneInfo.FindSystemTimeZoneById(options.TimeZone.Trim());
    }

    public static WindowCalendar Calendar(ScheduleOptions options) => WindowCalendar.Parse(options.EffectiveWindows, Zone(options));

    public static EncoderGate Gate(ScheduleOptions options) => new(Calendar(options), options.BudgetPagesPerHour);

    /// <summary>Null when the zone is found, else why not (for the validator).</summary>
    internal static string? ZoneProblem(string timeZone)
    {
        if (string.IsNullOrWhiteSpace(timeZone))
        {
            return null;
        }

        try
        {
            TimeZoneInfo.FindSystemTimeZoneById(timeZone.Trim());
            return null;
        }
        catch (Exception ex) when (ex is TimeZoneNotFoundException or InvalidTimeZoneException)
        {
            return $"'{timeZone}' is not a time zone this system knows; use an IANA id such as Europe/Berlin or America/New_York (the OS's zone database: /usr/share/zoneinfo on Linux).";
        }
    }
}
