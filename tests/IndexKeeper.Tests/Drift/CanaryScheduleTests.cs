using IndexKeeper.Core.Drift;

namespace IndexKeeper.Tests.Drift;

public sealed class CanaryScheduleTests
{
    private static readonly DateTime Now = new(2031, 3, 14, 8, 0, 0, DateTimeKind.Utc);
    private static readonly TimeSpan Day = TimeSpan.FromHours(24);

    [Theory]
    [InlineData(null, true)] // never checked
    [InlineData(-25.0, true)]
    [InlineData(-24.0, true)] // exactly one interval ago
    [InlineData(-23.9, false)]
    [InlineData(0.0, false)]
    [InlineData(1.0, true)] // a check "in the future": the clock went back, check again rather than wait
    public void A_check_is_due_once_the_interval_has_passed(double? hoursFromNow, bool due) =>
        Assert.Equal(due, CanarySchedule.IsDue(hoursFromNow is { } h ? Now.AddHours(h) : null, Day, Now));

    [Fact]
    public void The_interval_must_be_positive() =>
        Assert.Throws<ArgumentOutOfRangeException>(() => CanarySchedule.IsDue(null, TimeSpan.Zero, Now));
}
