using IndexKeeper.Core.Planning;
using IndexKeeper.Core.Queue;
using IndexKeeper.Core.Scheduling;

namespace IndexKeeper.Tests.Planning;

/// <summary>
/// The plan's finish time on constructed queues against schedules computed by hand (each written out
/// beside its test). Week days follow ISO 8601 (2026-12-08 is a Tuesday, 2026-12-12 a Saturday);
/// Berlin's offsets come from the IANA tz database (2026-10-25 03:00 CEST → 02:00 CET, 2026-03-29
/// 02:00 CET → 03:00 CEST).
/// </summary>
public sealed class WorkSimulatorTests
{
    private static readonly TimeZoneInfo Berlin = TimeZoneInfo.FindSystemTimeZoneById("Europe/Berlin");

    private static DateTimeOffset Utc(int month, int day, int hour, int minute = 0, int second = 0) => new(2026, month, day, hour, minute, second, TimeSpan.Zero);

    private static WorkForecast Simulate(WindowCalendar calendar, long budget, DateTimeOffset start, QueuedPages work, double secondsPerPage) =>
        WorkSimulator.Simulate(new EncoderGate(calendar, budget), start, work, secondsPerPage, [], WorkSimulator.DefaultHorizon);

    [Fact]
    public void Fresh_work_uses_the_budget_by_day_and_migration_waits_for_the_night()
    {
        // Window Mon-Fri 19:00-07:00 UTC, budget 10 pages/hour, 60 s per page; Tuesday 10:00, 25 fresh + 100 migration.
        //   10:00 budget grant 10 fresh, runs to 10:10 (15 left); budget spent until 11:00
        //   11:00 grant 10, runs to 11:10 (5 left)
        //   12:00 grant 5, runs to 12:05 → fresh done 12:05
        //   migration waits for the window: 19:00 + 100 × 1 min = 20:40 → all done 20:40
        var nights = WindowCalendar.Parse(["Mon-Fri 19:00-07:00"], TimeZoneInfo.Utc);
        var forecast = Simulate(nights, 10, Utc(12, 8, 10), new QueuedPages(25, 100, 0), 60);
        Assert.Equal(Utc(12, 8, 12, 5), forecast.FreshDone);
        Assert.Equal(Utc(12, 8, 20, 40), forecast.MigrationDone);
        Assert.Equal(Utc(12, 8, 10), forecast.CanaryDone);
        Assert.Equal(Utc(12, 8, 20, 40), forecast.AllDone);
        Assert.Equal(125 * 60, forecast.EncoderSeconds);
    }

    [Fact]
    public void Work_longer_than_a_window_continues_in_the_next_ones_in_priority_order()
    {
        // Window Sat 22:00-23:00 UTC, no budget, 90 s per page; Saturday 12 December 12:00, 100 migration + 10 canary.
        //   one window holds 3600 / 90 = 40 pages
        //   12 Dec 22:00-23:00: 40 migration (60 left); 19 Dec: 40 migration (20 left)
        //   26 Dec 22:00: 20 migration → done 22:30; 10 canary → done 22:30 + 15 min = 22:45
        var saturday = WindowCalendar.Parse(["Sat 22:00-23:00"], TimeZoneInfo.Utc);
        var forecast = Simulate(saturday, 0, Utc(12, 12, 12), new QueuedPages(0, 100, 10), 90);
        Assert.Equal(Utc(12, 26, 22, 30), forecast.MigrationDone);
        Assert.Equal(Utc(12, 26, 22, 45), forecast.CanaryDone);
        Assert.Equal(Utc(12, 26, 22, 45), forecast.AllDone);
    }

    [Fact]
    public void Only_pages_that_fit_before_the_window_closes_run_in_it()
    {
        // Window Sat 22:00-23:00 UTC, 1000 s per page: 3 pages fit (3000 s), a 4th would end at 23:06:40.
        //   12 Dec: 3 pages, 19 Dec: 3 pages, 26 Dec 22:00: the 7th → done 22:16:40
        var saturday = WindowCalendar.Parse(["Sat 22:00-23:00"], TimeZoneInfo.Utc);
        var forecast = Simulate(saturday, 0, Utc(12, 12, 12), new QueuedPages(0, 7, 0), 1000);
        Assert.Equal(Utc(12, 26, 22, 16, 40), forecast.AllDone);
    }

    [Theory]
    // Berlin "Sat 22:00-06:00", 60 s per page, migration only.
    // Autumn: 24 Oct 22:00 CEST = 20:00Z to 25 Oct 06:00 CET = 05:00Z: 9 real hours = 540 pages; the other
    //   60 run on 31 Oct from 22:00 CET = 21:00Z → done 22:00Z. (A wall-clock 8 h window would say 480.)
    [InlineData(10, 24, 600, "2026-10-31T22:00:00Z")]
    // Spring: 28 Mar 22:00 CET = 21:00Z to 29 Mar 06:00 CEST = 04:00Z: 7 real hours = 420 pages; the other
    //   60 run on 4 Apr from 22:00 CEST = 20:00Z → done 21:00Z.
    [InlineData(3, 28, 480, "2026-04-04T21:00:00Z")]
    public void Windows_across_daylight_saving_changes_hold_their_real_length(int month, int day, long pages, string done)
    {
        var calendar = WindowCalendar.Parse(["Sat 22:00-06:00"], Berlin);
        var forecast = Simulate(calendar, 0, Utc(month, day, 12), new QueuedPages(0, pages, 0), 60);
        Assert.Equal(DateTimeOffset.Parse(done, System.Globalization.CultureInfo.InvariantCulture), forecast.AllDone);
    }

    [Fact]
    public void Without_windows_fresh_work_runs_on_the_budget_and_bulk_work_never_finishes()
    {
        // No window, budget 5 pages/hour, 1 s per page, 12 fresh from 10:00:
        //   10:00 grant 5; 11:00 grant 5; 12:00 grant 2 → done 12:00:02. Migration never runs.
        var none = WindowCalendar.Parse([], TimeZoneInfo.Utc);
        var forecast = Simulate(none, 5, Utc(12, 8, 10), new QueuedPages(12, 3, 0), 1);
        Assert.Equal(Utc(12, 8, 12, 0, 2), forecast.FreshDone);
        Assert.Null(forecast.MigrationDone);
        Assert.Null(forecast.AllDone);

        var noBudget = Simulate(none, 0, Utc(12, 8, 10), new QueuedPages(1, 0, 0), 1);
        Assert.Null(noBudget.FreshDone);
    }

    [Fact]
    public void Budget_already_spent_before_the_start_delays_fresh_work()
    {
        // Budget 10/hour, 8 granted at 09:30: at 10:00 only 2 are left (run 10:00-10:02), the 09:30 grant
        // ages out at 10:30, then the last page → done 10:30 + 1 min = 10:31.
        var nights = WindowCalendar.Parse(["Mon-Fri 19:00-07:00"], TimeZoneInfo.Utc);
        var forecast = WorkSimulator.Simulate(new EncoderGate(nights, 10), Utc(12, 8, 10), new QueuedPages(3, 0, 0), 60, [new BudgetSpend(Utc(12, 8, 9, 30), 8)], WorkSimulator.DefaultHorizon);
        Assert.Equal(Utc(12, 8, 10, 31), forecast.FreshDone);
    }

    [Fact]
    public void No_work_is_done_at_the_start()
    {
        var nights = WindowCalendar.Parse(["Mon-Fri 19:00-07:00"], TimeZoneInfo.Utc);
        var forecast = Simulate(nights, 10, Utc(12, 8, 10), new QueuedPages(0, 0, 0), 60);
        Assert.Equal(Utc(12, 8, 10), forecast.AllDone);
        Assert.Equal(0, forecast.EncoderSeconds);
    }
}
