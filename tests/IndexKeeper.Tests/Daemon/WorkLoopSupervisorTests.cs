using IndexKeeper.Core.Health;
using IndexKeeper.Core.Queue;
using IndexKeeper.Core.Storage;
using IndexKeeper.Service.Daemon;
using IndexKeeper.Tests.Isolation;

namespace IndexKeeper.Tests.Daemon;

/// <summary>
/// The work loop's fault handling with an injected failing turn, driven as IndexWorker drives it: which
/// faults are retried, what health says meanwhile, when the loop gives up. Decided by turn count, never
/// by time (the back-off is a millisecond so the tests run quickly; nothing asserts on it).
/// </summary>
public sealed class WorkLoopSupervisorTests
{
    private static readonly HealthLimits Limits = new(TimeSpan.FromHours(1), 0.5, 0.1, TimeSpan.FromMinutes(15));

    [Fact]
    public void AnIOFaultIsRetriedShownAsDegradedAndClearedWhenItPasses()
    {
        var state = new DaemonState(TimeProvider.System, 16);
        var log = new ListLogger();
        using var stop = new CancellationTokenSource();
        HealthReport? during = null;
        HealthReport? after = null;
        var (turns, ended) = Drive(new WorkLoopSupervisor(Retry(maxRetries: 3), state, log), stop, turn =>
        {
            if (turn == 3)
            {
                during = HealthRules.Evaluate(state.HealthSnapshot(), Limits);
            }

            if (turn <= 3)
            {
                // What .NET raises for ENOSPC on Linux (the message is strerror's).
                throw new IOException("No space left on device");
            }

            if (turn == 5)
            {
                after = HealthRules.Evaluate(state.HealthSnapshot(), Limits);
                stop.Cancel();
            }
        });

        Assert.False(ended);
        Assert.Equal(5, turns);
        Assert.False(state.HasWorkLoopFailed);
        Assert.Equal(HealthStatus.Degraded, during!.Status);
        var reason = Assert.Single(during.Reasons);
        Assert.Equal("work-loop-retrying", reason.Code);
        Assert.Contains("No space left on device", reason.Message, StringComparison.Ordinal);
        Assert.Contains("retry 2 of 3", reason.Message, StringComparison.Ordinal);
        Assert.Equal(HealthStatus.Healthy, after!.Status);
        Assert.Equal(3, log.Messages.Count(m => m.StartsWith("Error: The work loop hit a fault: No space left on device", StringComparison.Ordinal)));
        Assert.Contains(log.Messages, m => m.Contains("carries on after 3 failed turn(s)", StringComparison.Ordinal));
    }

    [Fact]
    public void AnIOFaultThatOutlastsItsRetriesEndsTheLoop()
    {
        var state = new DaemonState(TimeProvider.System, 16);
        using var stop = new CancellationTokenSource();
        var (turns, ended) = Drive(new WorkLoopSupervisor(Retry(maxRetries: 2), state, new ListLogger()), stop, _ => throw new IOException("Too many open files"));

        Assert.True(ended);
        Assert.Equal(3, turns);
        Assert.True(state.HasWorkLoopFailed);
    }

    [Theory]
    [InlineData("bug")]
    [InlineData("damage")]
    [InlineData("no retries")]
    public void OtherFaultsEndTheLoopAtOnce(string kind)
    {
        var state = new DaemonState(TimeProvider.System, 16);
        var log = new ListLogger();
        using var stop = new CancellationTokenSource();
        Exception fault = kind switch
        {
            "bug" => new InvalidOperationException("the catalog is closed"),
            "damage" => new SegmentFormatException("/var/lib/indexkeeper/segments/000007.seg", 4096, "record checksum mismatch"),
            _ => new IOException("Input/output error"),
        };
        var checks = 0;
        var (turns, ended) = Drive(new WorkLoopSupervisor(Retry(maxRetries: kind == "no retries" ? 0 : 5), state, log), stop, _ => throw fault, () => checks++);

        Assert.True(ended);
        Assert.Equal(1, turns);
        Assert.Equal(0, checks);
        Assert.True(state.HasWorkLoopFailed);
        Assert.Contains(log.Messages, m => m.StartsWith("Critical: The work loop stopped: " + fault.Message, StringComparison.Ordinal));
    }

    [Fact]
    public void AnIOFaultAfterWhichTheIndexCannotBeUsedEndsTheLoopAtOnce()
    {
        var state = new DaemonState(TimeProvider.System, 16);
        var log = new ListLogger();
        using var stop = new CancellationTokenSource();
        var (turns, ended) = Drive(
            new WorkLoopSupervisor(Retry(maxRetries: 5), state, log),
            stop,
            _ => throw new IOException("No space left on device"),
            () => throw new IOException("No space left on device (the catalog's stored failure)"));

        Assert.True(ended);
        Assert.Equal(1, turns);
        Assert.True(state.HasWorkLoopFailed);
        Assert.Contains(log.Messages, m => m.StartsWith("Critical: The work loop hit a fault (No space left on device) after which the index cannot be used", StringComparison.Ordinal));
    }

    private static RetryPolicy Retry(int maxRetries) => new(maxRetries + 1, TimeSpan.FromMilliseconds(1), TimeSpan.FromMilliseconds(1));

    /// <summary>
    /// Runs numbered turns as IndexWorker does: a turn that goes through is reported, a failed one is handed
    /// to the supervisor. Returns the turns run and whether the supervisor ended the loop.
    /// </summary>
    private static (int Turns, bool Ended) Drive(WorkLoopSupervisor supervisor, CancellationTokenSource stop, Action<int> turn, Action? checkIndex = null)
    {
        var turns = 0;
        while (!stop.IsCancellationRequested)
        {
            try
            {
                turn(++turns);
                supervisor.Succeeded();
            }
            catch (Exception ex) when (ex is not Xunit.Sdk.XunitException)
            {
                if (!supervisor.Retry(ex, checkIndex ?? (() => { }), stop.Token))
                {
                    return (turns, true);
                }
            }
        }

        return (turns, false);
    }
}
