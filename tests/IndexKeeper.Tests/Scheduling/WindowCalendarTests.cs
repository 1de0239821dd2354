using IndexKeeper.Core.Scheduling;

namespace IndexKeeper.Tests.Scheduling;

/// <summary>
/// The window calendar against ISO 8601 (week days Monday = 1 … Sunday = 7) and the IANA time zone
/// database as installed by the OS (/usr/share/zoneinfo). Dates: 2026-12-01 is a Tuesday (ISO 8601
/// calendar, checked against `date` on this machine, where 2026-12-02 printed as Wednesday).
/// </summary>
public sealed class WindowCalendarTests
{
    private static readonly TimeZoneInfo Berlin = TimeZoneInfo.FindSystemTimeZoneById("Europe/Berlin");

    private static readonly TimeZoneInfo NewYork = TimeZoneInfo.FindSystemTimeZoneById("America/New_York");

    private static DateTimeOffset Utc(int month, int day, int hour, int minute = 0) => new(2026, month, day, hour, minute, 0, TimeSpan.Zero);

    [Theory]
    [InlineData("Mon-Fri 19:00-07:00")]
    [InlineData("1-5 19:00-07:00")]
    [InlineData("monday-friday 19:00 - 07:00")]
    [InlineData("1,2,3,4,5 19:00-07:00")]
    [InlineData("Mon,2-4,FRIDAY 19:00-07:00")]
    public void Day_numbers_and_names_mean_the_same_iso_days(string entry)
    {
        // ISO 8601: Monday is day 1, Friday day 5. 2026-12-04 is a Friday, 2026-12-05 a Saturday,
        // 2026-12-07 a Monday.
        var calendar = WindowCalendar.Parse([entry], TimeZoneInfo.Utc);
        Assert.True(calendar.IsOpen(Utc(12, 4, 23)));
        Assert.True(calendar.IsOpen(Utc(12, 5, 6, 59)));      // Friday's window runs past midnight into Saturday
        Assert.False(calendar.IsOpen(Utc(12, 5, 7)));         // the end is exclusive
        Assert.False(calendar.IsOpen(Utc(12, 5, 20)));        // Saturday is not listed
        Assert.False(calendar.IsOpen(Utc(12, 7, 6)));         // nor is Sunday, whose night would reach Monday
        Assert.True(calendar.IsOpen(Utc(12, 7, 19)));
        Assert.Equal(Utc(12, 4, 19), calendar.NextChange(Utc(12, 4, 18)));
        Assert.Equal(Utc(12, 5, 7), calendar.NextChange(Utc(12, 4, 19)));
        Assert.Equal(Utc(12, 7, 19), calendar.NextChange(Utc(12, 5, 7)));
    }

    [Fact]
    public void Day_seven_is_sunday_and_ranges_wrap_past_it()
    {
        // ISO 8601: Sunday is 7; 2026-12-06 is a Sunday.
        var sunday = WindowCalendar.Parse(["7 10:00-11:00"], TimeZoneInfo.Utc);
        Assert.True(sunday.IsOpen(Utc(12, 6, 10, 30)));
        Assert.False(sunday.IsOpen(Utc(12, 7, 10, 30)));

        var wrap = WindowCalendar.Parse(["Sat-Mon 12:00-13:00"], TimeZoneInfo.Utc);
        var open = Enumerable.Range(1, 7).Where(d => wrap.IsOpen(Utc(12, d, 12, 30))).ToArray();
        Assert.Equal([5, 6, 7], open);                          // Saturday 5th, Sunday 6th, Monday 7th
    }

    [Fact]
    public void Touching_windows_join_and_a_whole_week_never_changes()
    {
        var joined = WindowCalendar.Parse(["Mon 22:00-24:00", "Tue 00:00-02:00"], TimeZoneInfo.Utc);
        Assert.Equal(Utc(12, 8, 2), joined.NextChange(Utc(12, 7, 23)));
        Assert.Equal([(Utc(12, 7, 22), Utc(12, 8, 2))], joined.OpenSpans(Utc(12, 7, 0), Utc(12, 9, 0)).ToArray());

        // Across both of Berlin's 2026 changes, too: a whole-day window every day leaves no hole.
        var always = WindowCalendar.Parse(["daily 00:00-24:00"], Berlin);
        foreach (var instant in new[] { Utc(3, 29, 1), Utc(10, 25, 0, 30), Utc(10, 25, 1, 30) })
        {
            Assert.True(always.IsOpen(instant));
            Assert.Equal(DateTimeOffset.MaxValue, always.NextChange(instant));
        }

        var none = WindowCalendar.Parse([], Berlin);
        Assert.True(none.IsEmpty);
        Assert.False(none.IsOpen(Utc(3, 29, 1)));
        Assert.Equal(DateTimeOffset.MaxValue, none.NextChange(Utc(3, 29, 1)));
    }

    // IANA tz database, Europe/Berlin (EU rule): on Sunday 2026-03-29 at 01:00 UTC clocks go from 02:00
    // CET (+01:00) to 03:00 CEST (+02:00); local 02:00-02:59 does not exist that day.
    [Theory]
    [InlineData("Sun 02:30-04:00", "2026-03-29T01:00:00Z", "2026-03-29T02:00:00Z")] // start skipped: opens at the jump
    [InlineData("Sun 01:00-02:30", "2026-03-29T00:00:00Z", "2026-03-29T01:00:00Z")] // end skipped: closes at the jump
    [InlineData("Sat 22:00-06:00", "2026-03-28T21:00:00Z", "2026-03-29T04:00:00Z")] // across midnight and the change: 7 real hours
    [InlineData("Sun 01:30-03:30", "2026-03-29T00:30:00Z", "2026-03-29T01:30:00Z")] // wall 2 h, real 1 h
    // Same database: on Sunday 2026-10-25 at 01:00 UTC clocks go from 03:00 CEST back to 02:00 CET;
    // local 02:00-02:59 happens twice, the first time is meant.
    [InlineData("Sun 02:30-03:30", "2026-10-25T00:30:00Z", "2026-10-25T02:30:00Z")] // start repeated: the first 02:30
    [InlineData("Sun 01:00-02:30", "2026-10-24T23:00:00Z", "2026-10-25T00:30:00Z")] // end repeated: the first 02:30
    [InlineData("Sat 22:00-06:00", "2026-10-24T20:00:00Z", "2026-10-25T05:00:00Z")] // across midnight and the change: 9 real hours
    public void Berlin_daylight_saving_changes(string entry, string opens, string closes)
    {
        var calendar = WindowCalendar.Parse([entry], Berlin);
        var start = DateTimeOffset.Parse(opens, System.Globalization.CultureInfo.InvariantCulture);
        var end = DateTimeOffset.Parse(closes, System.Globalization.CultureInfo.InvariantCulture);
        var spans = calendar.OpenSpans(start.AddHours(-12), end.AddHours(12)).ToArray();
        Assert.Equal([(start, end)], spans);
        Assert.Equal(start, calendar.NextChange(start.AddMinutes(-1)));
        Assert.Equal(end, calendar.NextChange(start));
        Assert.True(calendar.IsOpen(start));
        Assert.False(calendar.IsOpen(end));
        Assert.False(calendar.IsOpen(start.AddSeconds(-1)));
    }

    [Fact]
    public void A_window_inside_the_skipped_hour_is_empty_that_day_only()
    {
        // IANA tz database: Berlin skips 02:00-02:59 on 2026-03-29 but not on 2026-03-22 (CET, +01:00).
        var calendar = WindowCalendar.Parse(["Sun 02:15-02:45"], Berlin);
        Assert.Empty(calendar.OpenSpans(Utc(3, 28, 12), Utc(3, 29, 12)));
        Assert.Equal([(Utc(3, 22, 1, 15), Utc(3, 22, 1, 45))], calendar.OpenSpans(Utc(3, 21, 12), Utc(3, 22, 12)).ToArray());
        Assert.Equal(Utc(4, 5, 0, 15), calendar.NextChange(Utc(3, 28, 12))); // next Sunday, CEST (+02:00)
    }

    // IANA tz database, America/New_York (US rule): 2026-03-08 02:00 EST (-05:00) jumps to 03:00 EDT
    // (-04:00) at 07:00 UTC; 2026-11-01 02:00 EDT falls back to 01:00 EST at 06:00 UTC.
    [Theory]
    [InlineData("2026-03-08T06:30:00Z", "2026-03-08T07:00:00Z")] // 01:30 EST to the jump (02:30 does not exist)
    [InlineData("2026-11-01T05:30:00Z", "2026-11-01T07:30:00Z")] // first 01:30 EDT to 02:30 EST: two real hours
    [InlineData("2026-07-01T05:30:00Z", "2026-07-01T06:30:00Z")] // an ordinary summer day
    public void New_york_daylight_saving_changes(string opens, string closes)
    {
        var calendar = WindowCalendar.Parse(["daily 01:30-02:30"], NewYork);
        var start = DateTimeOffset.Parse(opens, System.Globalization.CultureInfo.InvariantCulture);
        var end = DateTimeOffset.Parse(closes, System.Globalization.CultureInfo.InvariantCulture);
        Assert.Equal([(start, end)], calendar.OpenSpans(start.AddHours(-6), end.AddHours(6)).ToArray());
    }

    [Fact]
    public void Is_open_next_change_and_spans_agree_through_both_berlin_change_weeks()
    {
        var calendar = WindowCalendar.Parse(["Mon-Fri 19:00-07:00", "Sat,Sun 00:00-24:00", "Sun 02:30-03:15", "Wed 12:00-12:30"], Berlin);
        foreach (var weekStart in new[] { Utc(3, 25, 0), Utc(10, 21, 0) })
        {
            var weekEnd = weekStart.AddDays(7);
            var spans = calendar.OpenSpans(weekStart, weekEnd).ToArray();
            for (var t = weekStart; t < weekEnd; t = t.AddMinutes(5))
            {
                var inSpan = spans.Any(s => s.Start <= t && t < s.End);
                Assert.Equal(inSpan, calendar.IsOpen(t));
                var change = calendar.NextChange(t);
                Assert.True(change > t);
                Assert.NotEqual(calendar.IsOpen(t), calendar.IsOpen(change));
                Assert.Equal(calendar.IsOpen(t), calendar.IsOpen(change.AddSeconds(-1)));
            }
        }
    }

    [Theory]
    [InlineData("", "empty")]
    [InlineData("Mon-Fri", "separated by a space")]
    [InlineData("Mon-Fry 19:00-07:00", "'Fry' is not a day")]
    [InlineData("0 19:00-07:00", "'0' is not a day")]
    [InlineData("8 19:00-07:00", "'8' is not a day")]
    [InlineData("Mon 19:00", "not a time span")]
    [InlineData("Mon 19-07", "'19' is not a time")]
    [InlineData("Mon 25:00-07:00", "out of range")]
    [InlineData("Mon 19:60-07:00", "out of range")]
    [InlineData("Mon 24:00-07:00", "cannot start at 24:00")]
    [InlineData("Mon 07:00-07:00", "ambiguous")]
    [InlineData("Mon 7:5-08:00", "'7:5' is not a time")]
    public void Bad_entries_are_refused_naming_the_entry_and_why(string entry, string why)
    {
        var error = Assert.Throws<FormatException>(() => WindowCalendar.Parse(["Sat 00:00-24:00", entry], TimeZoneInfo.Utc));
        Assert.Contains($"Window 1 '{entry}'", error.Message, StringComparison.Ordinal);
        Assert.Contains(why, error.Message, StringComparison.Ordinal);
        Assert.NotNull(WindowCalendar.ProblemOf(entry));
    }
}
