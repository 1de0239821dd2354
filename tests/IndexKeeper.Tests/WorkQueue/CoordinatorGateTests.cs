using IndexKeeper.Core.Queue;
using IndexKeeper.Core.Scheduling;
using IndexKeeper.Service.Application;
using IndexKeeper.Service.Configuration;
using IndexKeeper.Service.Daemon;
using IndexKeeper.Service.WorkQueue;
using IndexKeeper.Tests.EndToEnd;
using IndexKeeper.Tests.Support;
using Microsoft.Extensions.Logging.Abstractions;
using Npgsql;

namespace IndexKeeper.Tests.WorkQueue;

/// <summary>
/// The coordinator's gate holds on every machine: its turns (<see cref="RemoteEmbedding"/>) run in this process on
/// a clock the test moves, over a real PostgreSQL, and a "worker" is the job statements a worker runs. Workers can
/// only claim what the gate released: the daytime budget outside windows, everything inside, and a window's end
/// takes back what the budget did not pay for. A job the budget paid for that comes back without vectors gives
/// its page of budget back.
/// </summary>
[Collection(PostgresCollection.Name)]
public sealed class CoordinatorGateTests : IDisposable
{
    private const int Pages = 12;
    private const long Budget = 5;

    // Monday 7 December 2026 (a Monday by the calendar); windows on weekday nights.
    private static readonly DateTimeOffset MondayNoon = new(2026, 12, 7, 12, 0, 0, TimeSpan.Zero);
    private static readonly DateTimeOffset MondayNight = new(2026, 12, 7, 22, 0, 0, TimeSpan.Zero);
    private static readonly DateTimeOffset TuesdayMorning = new(2026, 12, 8, 8, 0, 0, TimeSpan.Zero);

    private readonly TempDirectory temp = new();
    private readonly IndexComposition composed;
    private readonly NpgsqlDataSource database;
    private readonly Storage.ManualTimeProvider clock = new(MondayNoon);
    private readonly ScheduledEmbedGate gate = new(new EncoderGate(WindowCalendar.Parse(["Mon-Fri 19:00-07:00"], TimeZoneInfo.Utc), Budget));
    private readonly RemoteEmbedding coordinator;

    public CoordinatorGateTests(PostgresServer server)
    {
        ArgumentNullException.ThrowIfNull(server);
        Directory.CreateDirectory(temp.Combine("docs"));
        for (var i = 1; i <= Pages / 3; i++)
        {
            File.WriteAllBytes(temp.Combine("docs", $"site-{i}.pdf"), StorePdfs.Document($"site {i} gate", 3));
        }

        var options = OptionsLoader.Load(new ConfigurationSources(null, temp.Combine("index"), [], [
            "Detect:SettleSeconds=0", "Encoder:Name=hashed-terms", "Roots:0:Name=docs", $"Roots:0:Path={temp.Combine("docs")}",
            $"Queue:Connection={server.Connection(server.CreateDatabase())}", $"Queue:PasswordFile={server.PasswordFile}", "Queue:PublishAhead=100"]));
        composed = IndexComposition.Open(options, "test");
        var summary = composed.Get<ScanOperation>().Walk("test", composed.Settings.Scan.Roots, CancellationToken.None);
        Assert.Equal(Pages, summary.PagesNew);
        database = QueueDatabase.Create(options.Queue, "indexkeeper-test");
        var index = composed.Index;
        coordinator = new RemoteEmbedding(
            options.Queue, database, new PublishJobsOperation(index), new CommitResultsOperation(index, RetryPolicy.Default), index, gate, new DaemonState(clock, 16), NullLogger.Instance);
    }

    private JobTable Jobs => new(database);

    private string EncoderId => composed.Index.Encoder.Identity.Id;

    [Fact]
    public void Workers_get_only_what_the_gate_released()
    {
        // Outside a window: the budget's five fresh pages and no more, however often the coordinator looks.
        coordinator.Turn(() => false);
        var daytime = Jobs.Claim("worker", EncoderId, 100, TimeSpan.FromMinutes(5));
        Assert.Equal((int)Budget, daytime.Count);
        coordinator.Turn(() => false);
        Assert.Empty(Jobs.Claim("worker", EncoderId, 100, TimeSpan.FromMinutes(5)));

        // Inside the window: the rest.
        clock.Now = MondayNight;
        coordinator.Turn(() => false);
        Assert.Equal(Pages - (int)Budget, Jobs.Outstanding(EncoderId).Count - daytime.Count);

        // The window closed: what nobody claimed comes back, and the morning's budget (the grant of Monday noon
        // no longer counts) puts five of them out again. The claimed ones stay with their worker.
        clock.Now = TuesdayMorning;
        coordinator.Turn(() => false);
        Assert.Equal((int)Budget, Jobs.Claim("worker", EncoderId, 100, TimeSpan.FromMinutes(5)).Count);
        Assert.Equal(2 * (int)Budget, Jobs.Outstanding(EncoderId).Count);
    }

    [Fact]
    public void A_paid_job_that_comes_back_without_vectors_gives_its_budget_back()
    {
        coordinator.Turn(() => false);
        var first = Jobs.Claim("worker", EncoderId, 100, TimeSpan.FromMinutes(5));
        Assert.Equal((int)Budget, first.Count);
        foreach (var (job, _) in first)
        {
            Assert.True(Jobs.Fail("worker", job, JobFailure.Changed, "the file changed"));
        }

        // The next turn collects them (their pages wait for the next scan) and, with the budget given back,
        // publishes five other pages within the same hour; without the refund it would publish none.
        clock.Now = MondayNoon.AddMinutes(1);
        coordinator.Turn(() => false);
        var second = Jobs.Claim("worker", EncoderId, 100, TimeSpan.FromMinutes(5));
        Assert.Equal((int)Budget, second.Count);
        Assert.Empty(second.Select(c => c.Job.PageKey).Intersect(first.Select(c => c.Job.PageKey)));
        Assert.Equal(Budget, gate.Spends.Sum(s => s.Pages));
    }

    public void Dispose()
    {
        database.Dispose();
        composed.Dispose();
        temp.Dispose();
    }
}
