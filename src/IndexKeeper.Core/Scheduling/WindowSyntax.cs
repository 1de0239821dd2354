using System.Globalization;

namespace IndexKeeper.Core.Scheduling;

/// <summary>
/// Parses one window entry (grammar in docs/scheduling.md): <c>DAYS START-END</c>, e.g.
/// <c>Mon-Fri 19:00-07:00</c>, <c>6,7 00:00-24:00</c>, <c>daily 22:30-05:00</c>.
/// </summary>
internal static class WindowSyntax
{
    private const int MinutesPerDay = 24 * 60;

    private static readonly string[] ShortNames = ["mon", "tue", "wed", "thu", "fri", "sat", "sun"];

    private static readonly string[] LongNames = ["monday", "tuesday", "wednesday", "thursday", "friday", "saturday", "sunday"];

    /// <summary>Returns the rule, or null with <paramref name="why"/> saying what is wrong.</summary>
    public static WindowRule? TryParse(string? entry, out string why)
    {
        why = string.Empty;
        var text = (entry ?? string.Empty).Trim();
        if (text.Length == 0)
        {
            why = "the entry is empty; write DAYS START-END, e.g. 'Mon-Fri 19:00-07:00'";
            return null;
        }

        var space = text.IndexOfAny([' ', '\t']);
        if (space < 0)
        {
            why = "days and times must be separated by a space, e.g. 'Mon-Fri 19:00-07:00'";
            return null;
        }

        var days = ParseDays(text[..space], out why);
        if (days == 0)
        {
            return null;
        }

        var times = text[(space + 1)..].Replace(" ", string.Empty, StringComparison.Ordinal).Replace("\t", string.Empty, StringComparison.Ordinal);
        var dash = times.IndexOf('-', StringComparison.Ordinal);
        if (dash < 0)
        {
            why = $"'{times}' is not a time span; write START-END in 24-hour local time, e.g. 19:00-07:00";
            return null;
        }

        if (!TryTime(times[..dash], allowEndOfDay: false, out var start, out why) || !TryTime(times[(dash + 1)..], allowEndOfDay: true, out var end, out why))
        {
            return null;
        }

        if (start == end)
        {
            why = $"start and end are both {times[..dash]}, which is ambiguous; write 00:00-24:00 for a whole day";
            return null;
        }

        // An end at or before the start means the window runs past midnight into the next day.
        return new WindowRule(days, start, end > start ? end : end + MinutesPerDay);
    }

    /// <summary>A bit mask of ISO days (bit 1 Monday … bit 7 Sunday), or 0 with a reason.</summary>
    private static int ParseDays(string text, out string why)
    {
        why = string.Empty;
        if (text.Equals("daily", StringComparison.OrdinalIgnoreCase))
        {
            return 0b1111_1110;
        }

        var mask = 0;
        foreach (var item in text.Split(','))
        {
            var dash = item.IndexOf('-', StringComparison.Ordinal);
            var first = Day(dash < 0 ? item : item[..dash], out why);
            var last = dash < 0 ? first : Day(item[(dash + 1)..], out why);
            if (first == 0 || last == 0)
            {
                return 0;
            }

            // A range runs forward through the week and wraps past Sunday: Sat-Mon is 6, 7, 1.
            for (var day = first; ; day = day % 7 + 1)
            {
                mask |= 1 << day;
                if (day == last)
                {
                    break;
                }
            }
        }

        return mask;
    }

    private static int Day(string text, out string why)
    {
        why = string.Empty;
        var lower = text.Trim().ToLowerInvariant();
        if (lower.Length == 1 && lower[0] is >= '1' and <= '7')
        {
            return lower[0] - '0';
        }

        var index = Array.IndexOf(ShortNames, lower);
        index = index >= 0 ? index : Array.IndexOf(LongNames, lower);
        if (index >= 0)
        {
            return index + 1;
        }

        why = $"'{text}' is not a day; use ISO 8601 day numbers 1 (Monday) to 7 (Sunday), names such as Mon or Monday, ranges such as Mon-Fri, lists such as 6,7, or 'daily'";
        return 0;
    }

    private static bool TryTime(string text, bool allowEndOfDay, out int minutes, out string why)
    {
        minutes = 0;
        why = string.Empty;
        var parts = text.Split(':');
        if (parts.Length != 2 || parts[0].Length is < 1 or > 2 || parts[1].Length != 2
            || !int.TryParse(parts[0], NumberStyles.None, CultureInfo.InvariantCulture, out var hours)
            || !int.TryParse(parts[1], NumberStyles.None, CultureInfo.InvariantCulture, out var mins))
        {
            why = $"'{text}' is not a time; write HH:MM in 24-hour local time, e.g. 07:30";
            return false;
        }

        if (hours == 24 && mins == 0)
        {
            if (!allowEndOfDay)
            {
                why = "a window cannot start at 24:00; start at 00:00 of the next day";
                return false;
            }

            minutes = MinutesPerDay;
            return true;
        }

        if (hours > 23 || mins > 59)
        {
            why = $"'{text}' is out of range; hours run 00 to 23 (24:00 only as an end), minutes 00 to 59";
            return false;
        }

        minutes = (hours * 60) + mins;
        return true;
    }
}
