using IndexKeeper.Core.Planning;
using IndexKeeper.Core.Scheduling;

namespace IndexKeeper.Tests.Planning;

/// <summary>
/// When a retraining may run (docs/search.md, "Retraining"): inside a window, only where its estimate fits before
/// the window closes. The clock is moved by hand; 2026-12-02 is a Wednesday (ISO 8601 calendar).
/// </summary>
public sealed class RetrainingSlotTests
{
    private static readonly WindowCalendar Nights = WindowCalendar.Parse(["Mon-Fri 19:00-07:00"], TimeZoneInfo.Utc);

    private static DateTimeOffset Wednesday(int hour, int minute = 0) => new(2026, 12, 2, hour, minute, 0, TimeSpan.Zero);

    [Fact]
    public void Outside_the_windows_it_waits_for_the_next_opening()
    {
        Assert.Equal(Wednesday(19), RetrainingSlot.Next(Nights, Wednesday(12), seconds: 3600));
    }

    [Fact]
    public void Inside_a_window_with_room_for_the_estimate_it_runs_now()
    {
        Assert.Equal(Wednesday(20, 30), RetrainingSlot.Next(Nights, Wednesday(20, 30), seconds: 3600));
    }

    [Fact]
    public void Inside_a_window_too_short_for_the_estimate_it_waits_for_the_next_window()
    {
        // Thursday 06:30: half an hour left of Wednesday night; an hour's build waits for Thursday 19:00.
        var thursdayMorning = new DateTimeOffset(2026, 12, 3, 6, 30, 0, TimeSpan.Zero);
        Assert.Equal(new DateTimeOffset(2026, 12, 3, 19, 0, 0, TimeSpan.Zero), RetrainingSlot.Next(Nights, thursdayMorning, seconds: 3600));
        Assert.Equal(thursdayMorning, RetrainingSlot.Next(Nights, thursdayMorning, seconds: 1800));
    }

    [Fact]
    public void Friday_night_runs_into_saturday_and_the_weekend_has_no_window()
    {
        // Saturday 08:00: the Friday night window ended at 07:00; the next opens Monday 19:00.
        var saturday = new DateTimeOffset(2026, 12, 5, 8, 0, 0, TimeSpan.Zero);
        Assert.Equal(new DateTimeOffset(2026, 12, 7, 19, 0, 0, TimeSpan.Zero), RetrainingSlot.Next(Nights, saturday, seconds: 600));
    }

    [Fact]
    public void An_estimate_longer_than_every_window_finds_no_slot()
    {
        Assert.Null(RetrainingSlot.Next(Nights, Wednesday(12), seconds: TimeSpan.FromHours(13).TotalSeconds));
    }
}
