using IndexKeeper.Core.Queue;

namespace IndexKeeper.Tests.Queue;

/// <summary>Exponential back-off (common practice: double the delay per failure, with a cap) and quarantine after the last attempt.</summary>
public sealed class RetryPolicyTests
{
    private static readonly DateTime Now = new(2026, 10, 25, 1, 0, 0, DateTimeKind.Utc);

    [Theory]
    [InlineData(1, 30)]
    [InlineData(2, 60)]
    [InlineData(3, 120)]
    [InlineData(4, 240)]
    public void DelayDoublesPerFailure(int attempts, double seconds) =>
        Assert.Equal(Now.AddSeconds(seconds), new RetryPolicy(5, TimeSpan.FromSeconds(30), TimeSpan.FromHours(1)).NextTry(attempts, Now));

    [Fact]
    public void DelayIsCapped() =>
        Assert.Equal(Now.AddMinutes(10), new RetryPolicy(100, TimeSpan.FromMinutes(1), TimeSpan.FromMinutes(10)).NextTry(99, Now));

    [Fact]
    public void TheLastAllowedAttemptQuarantines()
    {
        var policy = new RetryPolicy(3, TimeSpan.FromSeconds(1), TimeSpan.FromHours(1));
        Assert.NotNull(policy.NextTry(2, Now));
        Assert.Null(policy.NextTry(3, Now));
        Assert.Null(policy.NextTry(4, Now));
    }

    [Fact]
    public void ZeroAttemptsIsAMistake() =>
        Assert.Throws<ArgumentOutOfRangeException>(() => RetryPolicy.Default.NextTry(0, Now));
}
