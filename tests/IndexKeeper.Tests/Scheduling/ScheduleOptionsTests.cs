using IndexKeeper.Service.Configuration;

namespace IndexKeeper.Tests.Scheduling;

/// <summary>The Schedule section is checked at start, every bad setting named.</summary>
public sealed class ScheduleOptionsTests
{
    private static IndexKeeperOptions Valid() => new() { IndexDirectory = "idx", Roots = [new RootOptions { Name = "docs", Path = "docs" }] };

    [Fact]
    public void Every_bad_schedule_setting_is_named()
    {
        var options = Valid();
        options.Schedule.TimeZone = "Europe/Atlantis";
        options.Schedule.Windows = ["Mon-Fri 19:00-07:00", "Funday 10:00-11:00", "Sat 10:00"];
        options.Schedule.BudgetPagesPerHour = -1;
        var errors = IndexKeeperOptionsValidator.Validate(options);
        Assert.Equal(4, errors.Count);
        Assert.Contains(errors, e => e.StartsWith("Schedule:TimeZone: 'Europe/Atlantis'", StringComparison.Ordinal));
        Assert.Contains(errors, e => e.StartsWith("Schedule:Windows:1: 'Funday 10:00-11:00'", StringComparison.Ordinal) && e.Contains("'Funday' is not a day", StringComparison.Ordinal));
        Assert.Contains(errors, e => e.StartsWith("Schedule:Windows:2: 'Sat 10:00'", StringComparison.Ordinal));
        Assert.Contains(errors, e => e.StartsWith("Schedule:BudgetPagesPerHour", StringComparison.Ordinal));
    }

    [Fact]
    public void Defaults_are_valid_and_cover_weekday_nights_and_weekends()
    {
        var options = Valid();
        options.Schedule.TimeZone = "Europe/Berlin"; // an IANA tz database id
        Assert.Empty(IndexKeeperOptionsValidator.Validate(options));
        var calendar = ScheduleSetup.Calendar(options.Schedule);
        Assert.Equal("Europe/Berlin", calendar.Zone.Id);

        // Berlin in December is CET (+01:00). 2026-12-07 is a Monday (ISO 8601).
        var mondayMorning = new DateTimeOffset(2026, 12, 7, 6, 59, 0, TimeSpan.FromHours(1));
        Assert.True(calendar.IsOpen(mondayMorning));                          // the weekend runs on into Monday 07:00
        Assert.False(calendar.IsOpen(mondayMorning.AddMinutes(1)));
        Assert.Equal(mondayMorning.AddMinutes(1).AddHours(12), calendar.NextChange(mondayMorning.AddMinutes(1))); // 19:00
    }
}
