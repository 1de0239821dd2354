using IndexKeeper.Service.WorkQueue;

namespace IndexKeeper.Tests.WorkQueue;

public sealed class GatherHoldTests
{
    private static readonly TimeSpan Gather = TimeSpan.FromSeconds(5);

    private static FinishedLook Gathering(long back, double oldestSeconds) => new([], back, TimeSpan.FromSeconds(oldestSeconds));

    [Fact]
    public void Nothing_back_or_a_commits_worth_back_holds_nothing()
    {
        Assert.Equal(TimeSpan.Zero, GatherHold.After(Gathering(0, 0), 64, 256, Gather));
        Assert.Equal(TimeSpan.Zero, GatherHold.After(Gathering(64, 1), 64, 256, Gather));
        Assert.Equal(TimeSpan.Zero, GatherHold.After(Gathering(100, 1), 64, 256, Gather));
    }

    [Fact]
    public void A_look_that_took_jobs_holds_nothing()
    {
        var job = new FinishedJob(new PageJob(new string('a', 64), new string('b', 64), "docs", "a.pdf", 1, new string('c', 64), 0), JobState.Done, "w", null, null, null, null);
        Assert.Equal(TimeSpan.Zero, GatherHold.After(new FinishedLook([job], 3, TimeSpan.FromSeconds(1)), 64, 256, Gather));
    }

    [Fact]
    public void The_rest_of_a_commit_is_awaited_at_the_rate_results_came_back()
    {
        // 16 back within 0.5 s: 32 a second, so the other 48 take 1.5 s.
        Assert.Equal(TimeSpan.FromSeconds(1.5), GatherHold.After(Gathering(16, 0.5), 64, 256, Gather));

        // Half back: as long again as the oldest has waited.
        Assert.Equal(TimeSpan.FromSeconds(2), GatherHold.After(Gathering(32, 2), 64, 256, Gather));
    }

    [Fact]
    public void No_hold_lasts_past_the_oldest_results_gathering_time()
    {
        // At one a 4 s, 63 more would take minutes; the oldest is taken when it has waited 5 s.
        Assert.Equal(TimeSpan.FromSeconds(1), GatherHold.After(Gathering(1, 4), 64, 256, Gather));
        Assert.Equal(TimeSpan.Zero, GatherHold.After(Gathering(1, 6), 64, 256, Gather));
    }

    [Fact]
    public void With_fewer_jobs_out_than_a_commit_the_look_comes_when_all_should_be_back()
    {
        // 16 of the 24 jobs out came back in 1 s: the other 8 in about 0.5 s, then all are taken at once.
        Assert.Equal(TimeSpan.FromSeconds(0.5), GatherHold.After(Gathering(16, 1), 64, 24, Gather));
        Assert.Equal(TimeSpan.Zero, GatherHold.After(Gathering(24, 1), 64, 24, Gather));
    }
}
