namespace IndexKeeper.Core.Scheduling;

/// <summary>
/// Recurring windows (off-hours when bulk work may use the encoder at full speed) in one time zone.
/// Pure: no clock; every answer follows from the entries, the zone's rules and the instant asked about.
/// Syntax and daylight-saving rules: docs/scheduling.md.
/// </summary>
public sealed class WindowCalendar
{
    /// <summary>Weekly windows repeat; an open or closed stretch longer than this one never ends.</summary>
    private static readonly TimeSpan Horizon = TimeSpan.FromDays(15);

    private readonly IReadOnlyList<WindowRule> rules;

    private WindowCalendar(IReadOnlyList<WindowRule> rules, TimeZoneInfo zone, IReadOnlyList<string> entries)
    {
        this.rules = rules;
        Zone = zone;
        Entries = entries;
    }

    public TimeZoneInfo Zone { get; }

    /// <summary>The entries as given, trimmed.</summary>
    public IReadOnlyList<string> Entries { get; }

    /// <summary>True when there is no window at all: bulk work never runs.</summary>
    public bool IsEmpty => rules.Count == 0;

    /// <summary>Parses window entries (e.g. <c>Mon-Fri 19:00-07:00</c>); throws naming the first bad entry and why.</summary>
    public static WindowCalendar Parse(IReadOnlyList<string> windows, TimeZoneInfo zone)
    {
        ArgumentNullException.ThrowIfNull(windows);
        ArgumentNullException.ThrowIfNull(zone);
        var rules = new List<WindowRule>(windows.Count);
        for (var i = 0; i < windows.Count; i++)
        {
            var rule = WindowSyntax.TryParse(windows[i], out var why)
                ?? throw new FormatException($"Window {i} '{windows[i]}': {why}.");
            rules.Add(rule);
        }

        return new WindowCalendar(rules, zone, windows.Select(w => w.Trim()).ToList());
    }

    /// <summary>Null when <paramref name="window"/> is a valid entry, else why it is not.</summary>
    public static string? ProblemOf(string? window) => WindowSyntax.TryParse(window, out var why) is null ? why : null;

    public bool IsOpen(DateTimeOffset instant) => Merged(instant, instant).Any(s => s.Start <= instant && instant < s.End);

    /// <summary>The next instant after <paramref name="instant"/> at which open/closed flips; <see cref="DateTimeOffset.MaxValue"/> if never.</summary>
    public DateTimeOffset NextChange(DateTimeOffset instant)
    {
        var limit = instant + Horizon;
        foreach (var (start, end) in Merged(instant, limit))
        {
            if (start <= instant && instant < end)
            {
                return end >= limit ? DateTimeOffset.MaxValue : end;
            }

            if (start > instant)
            {
                return start;
            }
        }

        return DateTimeOffset.MaxValue;
    }

    /// <summary>The open stretches overlapping [from, to), clipped to it, in order; touching windows are joined.</summary>
    public IEnumerable<(DateTimeOffset Start, DateTimeOffset End)> OpenSpans(DateTimeOffset from, DateTimeOffset to)
    {
        if (to <= from)
        {
            yield break;
        }

        foreach (var (start, end) in Merged(from, to))
        {
            if (end > from && start < to)
            {
                yield return (start > from ? start : from, end < to ? end : to);
            }
        }
    }

    /// <summary>
    /// Every occurrence of every window on local days around [from, to], joined where they overlap or
    /// touch. Windows last at most a day and start on their listed day, so two days of margin before
    /// and one after cover any that reach into the range.
    /// </summary>
    private List<(DateTimeOffset Start, DateTimeOffset End)> Merged(DateTimeOffset from, DateTimeOffset to)
    {
        var occurrences = new List<(DateTimeOffset Start, DateTimeOffset End)>();
        var last = ZoneClock.LocalDate(Zone, to).AddDays(1);
        for (var day = ZoneClock.LocalDate(Zone, from).AddDays(-2); day <= last; day = day.AddDays(1))
        {
            foreach (var rule in rules)
            {
                if (!rule.StartsOn(day.DayOfWeek))
                {
                    continue;
                }

                var start = ZoneClock.Resolve(Zone, day.AddMinutes(rule.StartMinute));
                var end = ZoneClock.Resolve(Zone, day.AddMinutes(rule.EndMinute));
                if (end > start)
                {
                    occurrences.Add((start, end));
                }
            }
        }

        occurrences.Sort((a, b) => a.Start.CompareTo(b.Start));
        var merged = new List<(DateTimeOffset Start, DateTimeOffset End)>();
        foreach (var occurrence in occurrences)
        {
            if (merged.Count > 0 && occurrence.Start <= merged[^1].End)
            {
                if (occurrence.End > merged[^1].End)
                {
                    merged[^1] = (merged[^1].Start, occurrence.End);
                }
            }
            else
            {
                merged.Add(occurrence);
            }
        }

        return merged;
    }
}
