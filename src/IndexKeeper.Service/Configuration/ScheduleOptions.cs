namespace IndexKeeper.Service.Configuration;

/// <summary>When queued work may use the encoder (docs/scheduling.md).</summary>
public sealed class ScheduleOptions
{
    /// <summary>Windows used when none are configured: weekday nights and whole weekends.</summary>
    public static IReadOnlyList<string> DefaultWindows { get; } = ["Mon-Fri 00:00-07:00", "Mon-Fri 19:00-24:00", "Sat,Sun 00:00-24:00"];

    /// <summary>IANA time zone id the windows are read in (e.g. Europe/Berlin); empty takes the machine's zone.</summary>
    public string TimeZone { get; set; } = string.Empty;

    /// <summary>Recurring windows, e.g. "Mon-Fri 19:00-07:00"; empty takes <see cref="DefaultWindows"/>.</summary>
    public List<string> Windows { get; set; } = [];

    /// <summary>Fresh pages per rolling hour allowed outside windows, so new documents are searchable soon; 0 = none.</summary>
    public long BudgetPagesPerHour { get; set; } = 600;

    /// <summary>The windows in force: the configured ones, or the defaults when none are.</summary>
    public IReadOnlyList<string> EffectiveWindows => Windows.Count > 0 ? Windows : DefaultWindows;
}
