using System.Text.Json;
using IndexKeeper.Service.WorkQueue;
using IndexKeeper.Tests.Daemon;

namespace IndexKeeper.Tests.WorkQueue;

/// <summary>
/// A coordinator (<c>run</c> with Queue:Connection) and worker processes over a real-PDF store build the
/// same index as one process: same page keys, same stored vector bytes per key, same top-10 hits. Faults are
/// injected at named points (docs/work-queue.md, "Faults"), never by timing.
/// </summary>
[Collection(PostgresCollection.Name)]
public sealed class DistributedBuildTests(PostgresServer server)
{
    private const string Jobs = QueueSchema.Name + ".jobs";
    private const string Workers = QueueSchema.Name + ".workers";

    [Fact]
    public void Coordinator_and_two_workers_build_what_one_process_builds_and_another_encoder_changes_nothing()
    {
        using var store = new QueueStore(server);
        using (var daemon = RunningDaemon.Start(store.Temp.Path, store.CoordinatorArgs))
        using (var one = new RunningWorker(store.Temp.Path, store.WorkerArgs("one")))
        using (var two = new RunningWorker(store.Temp.Path, store.WorkerArgs("two")))
        using (var stranger = new RunningWorker(store.Temp.Path, store.WorkerArgs("stranger", "--Encoder:Dimensions=256")))
        {
            QueueStore.WaitUntilComplete(daemon);

            // Status and metrics show the workers, the stranger with its own encoder id.
            daemon.WaitUntil("the workers are in the status", () => daemon.GetJson("/api/status").TryGetProperty("workQueue", out var q)
                && q.GetProperty("workers").GetArrayLength() == 3 && q.GetProperty("committed").GetInt64() == QueueStore.Pages);
            var queue = daemon.GetJson("/api/status").GetProperty("workQueue");
            var encoders = queue.GetProperty("workers").EnumerateArray().ToDictionary(w => w.GetProperty("worker").GetString()!, w => w.GetProperty("encoderId").GetString());
            Assert.Equal(encoders["one"], encoders["two"]);
            Assert.NotEqual(encoders["one"], encoders["stranger"]);
            Assert.Equal(0, queue.GetProperty("rejected").GetInt64());
            var metrics = daemon.GetText("/metrics");
            Assert.Contains("indexkeeper_work_queue_workers", metrics, StringComparison.Ordinal);
            Assert.Contains("worker=\"stranger\"", metrics, StringComparison.Ordinal);

            // The plan counts the live workers of the active encoder only, at their measured rates. The rates
            // come from the daemon's last look at the heartbeats, which may predate the heartbeat that carried
            // a worker's first pages on a loaded machine: wait for it rather than race it.
            var plan = default(JsonElement);
            daemon.WaitUntil("the plan counts the workers' measured rates", () =>
                (plan = daemon.GetJson("/api/plan")).GetProperty("workersPagesPerSecond").ValueKind == JsonValueKind.Number);
            Assert.Equal(2, plan.GetProperty("liveWorkers").GetInt32());
            Assert.True(plan.GetProperty("workersPagesPerSecond").GetDouble() > 0);
            Assert.Equal(0, one.Terminate());
            Assert.Equal(0, two.Terminate());
            Assert.Equal(0, stranger.Terminate());
            Assert.Equal(0, daemon.Terminate(TimeSpan.FromSeconds(60)));
        }

        store.AssertSameAsReference();

        // Each page encoded once; the worker of another encoder id took no job; finished rows are gone.
        Assert.Equal(QueueStore.Pages, store.Scalar($"SELECT sum(pages_done) FROM {Workers} WHERE worker IN ('one', 'two')"));
        Assert.Equal(0, store.Scalar($"SELECT pages_done FROM {Workers} WHERE worker = 'stranger'"));
        Assert.Equal(2, store.Scalar($"SELECT count(DISTINCT encoder_id) FROM {Workers}"));
        Assert.Equal(0, store.Scalar($"SELECT count(*) FROM {Jobs}"));
    }

    [Fact]
    public void Killed_worker_and_killed_coordinator_lose_nothing_and_commit_nothing_twice()
    {
        using var store = new QueueStore(server);
        int coordinatorExit;
        using (var daemon = RunningDaemon.Start(store.Temp.Path, store.CoordinatorArgs, environment: Fault("queue.commit.after")))
        {
            // A worker that dies right after its first claim: its jobs come back only when their lease expires.
            using (var doomed = new RunningWorker(store.Temp.Path, store.WorkerArgs("doomed"), Fault("worker.claim.after")))
            {
                Assert.Equal(86, doomed.WaitForExit(RunningDaemon.Patience));
            }

            // The coordinator dies right after its first commit of handed-back vector sets, before deleting their jobs.
            using var survivor = new RunningWorker(store.Temp.Path, store.WorkerArgs("survivor"));
            Assert.True(daemon.WaitUntilOrExit("the coordinator's armed fault fires", () => false));
            coordinatorExit = daemon.ExitCode;
            survivor.Terminate();
        }

        Assert.Equal(86, coordinatorExit);
        Assert.True(store.Scalar($"SELECT count(*) FROM {Jobs}") > 0, "jobs and results survive the coordinator");

        using (var daemon = RunningDaemon.Start(store.Temp.Path, store.CoordinatorArgs))
        using (var late = new RunningWorker(store.Temp.Path, store.WorkerArgs("late")))
        {
            QueueStore.WaitUntilComplete(daemon);
            late.Terminate();
            var status = daemon.GetJson("/api/status");

            // One vector set per page, none dead: no page was committed twice.
            Assert.Equal(QueueStore.Pages, status.GetProperty("vectorSets").GetInt64());
            Assert.Equal(0, daemon.Terminate(TimeSpan.FromSeconds(60)));
        }

        store.AssertSameAsReference();
        Assert.True(store.Scalar($"SELECT sum(leases_taken_over) FROM {Workers}") >= 1, "the doomed worker's claims were taken over after their lease");
        var encoded = store.Scalar($"SELECT sum(pages_done) FROM {Workers}");
        Assert.InRange(encoded, QueueStore.Pages, QueueStore.Pages + 8);
        Assert.Equal(0, store.Scalar($"SELECT count(*) FROM {Jobs}"));
    }

    [Fact]
    public void Unreachable_database_degrades_health_and_the_coordinator_embeds_locally()
    {
        using var store = new QueueStore(server);

        // A loopback port nothing listens on: PostgreSQL out of reach, which is no reason not to start.
        var port = PostgresServer.FreePort();
        using var daemon = RunningDaemon.Start(store.Temp.Path, ["--root", "docs", "--Daemon:SampleSeconds=1", $"--Queue:Connection=Host=127.0.0.1;Port={port};Username=nobody;Database=none", "--Queue:ReconnectMaxSeconds=2"]);
        QueueStore.WaitUntilComplete(daemon);
        daemon.WaitUntil("health names the work queue", () => daemon.Health().Contains("work-queue-unreachable", StringComparison.Ordinal));
        using var health = System.Text.Json.JsonDocument.Parse(daemon.Health());
        Assert.Equal("degraded", health.RootElement.GetProperty("status").GetString());
        Assert.Equal(0, daemon.Terminate(TimeSpan.FromSeconds(60)));
        store.AssertSameAsReference();
    }

    [Fact]
    public void Unreachable_database_with_wait_embeds_nothing()
    {
        using var store = new QueueStore(server);
        var port = PostgresServer.FreePort();
        using var daemon = RunningDaemon.Start(store.Temp.Path, ["--root", "docs", "--Daemon:SampleSeconds=1", $"--Queue:Connection=Host=127.0.0.1;Port={port};Username=nobody;Database=none", "--Queue:WhenUnreachable=wait"]);
        daemon.WaitUntil("the pages are queued and health names the work queue", () =>
            daemon.GetJson("/api/status").GetProperty("queued").GetInt64() == QueueStore.Pages && daemon.Health().Contains("work-queue-unreachable", StringComparison.Ordinal));
        Assert.Equal(0, daemon.GetJson("/api/status").GetProperty("liveVectorSets").GetInt64());
    }

    [Fact]
    public void Coordinator_reconnects_after_PostgreSQL_went_away_and_came_back()
    {
        // A server of this test's own: the shared one stays up for the others.
        using var own = new PostgresServer();
        using var store = new QueueStore(own);
        using var daemon = RunningDaemon.Start(store.Temp.Path, [.. store.CoordinatorArgs, "--Queue:WhenUnreachable=wait", "--Queue:ReconnectMaxSeconds=1"]);
        daemon.WaitUntil("jobs are published", () => store.Scalar($"SELECT count(*) FROM {Jobs}") == QueueStore.Pages);

        own.Stop();
        daemon.WaitUntil("health names the work queue", () => daemon.Health().Contains("work-queue-unreachable", StringComparison.Ordinal));
        Assert.Equal(0, daemon.GetJson("/api/status").GetProperty("liveVectorSets").GetInt64());

        own.Start();
        using var worker = new RunningWorker(store.Temp.Path, store.WorkerArgs("after"));
        QueueStore.WaitUntilComplete(daemon);
        daemon.WaitUntil("health no longer names the work queue", () => !daemon.Health().Contains("work-queue-unreachable", StringComparison.Ordinal));
        worker.Terminate();
        Assert.Equal(0, daemon.Terminate(TimeSpan.FromSeconds(60)));
        store.AssertSameAsReference();
    }

    // Before: the turn PostgreSQL's loss interrupted left its claims behind, and the worker's heartbeat renewed
    // their leases after the restart, so nobody ever claimed those pages again.
    [Fact]
    public void Worker_waits_out_PostgreSQL_going_away_and_claims_again_after()
    {
        using var own = new PostgresServer();
        using var store = new QueueStore(own);
        using var daemon = RunningDaemon.Start(store.Temp.Path, [.. store.CoordinatorArgs, "--Queue:WhenUnreachable=wait", "--Queue:ReconnectMaxSeconds=1"]);
        daemon.WaitUntil("jobs are published", () => store.Scalar($"SELECT count(*) FROM {Jobs}") == QueueStore.Pages);
        using var worker = new RunningWorker(store.Temp.Path, store.WorkerArgs("steadfast", "--Queue:ReconnectMaxSeconds=1"));
        daemon.WaitUntil("the worker has connected", () => worker.Stderr.Contains("takes jobs", StringComparison.Ordinal));

        // Wherever the worker is (claiming, reading, encoding, handing back), the database goes away under it.
        own.Stop();
        daemon.WaitUntil("the worker notices", () => worker.Stderr.Contains("PostgreSQL is out of reach", StringComparison.Ordinal));
        own.Start();

        // The same worker process, never restarted, finishes the store: nothing lost, nothing committed twice.
        try
        {
            QueueStore.WaitUntilComplete(daemon);
        }
        catch (Xunit.Sdk.XunitException ex)
        {
            using var connection = own.Admin(store.Database);
            using var command = connection.CreateCommand();
            command.CommandText = $"SELECT string_agg(state || ':' || coalesce(worker, '-') || ':' || claims, ' ') FROM {Jobs}";
            throw new Xunit.Sdk.XunitException(ex.Message + "\nJobs (state:worker:claims): " + command.ExecuteScalar() + "\nThe worker's log:\n" + worker.Stderr);
        }

        Assert.Equal(QueueStore.Pages, daemon.GetJson("/api/status").GetProperty("vectorSets").GetInt64());
        daemon.WaitUntil("finished jobs are deleted", () => store.Scalar($"SELECT count(*) FROM {Jobs}") == 0);
        worker.Terminate();
        Assert.Equal(0, daemon.Terminate(TimeSpan.FromSeconds(60)));
        store.AssertSameAsReference();
    }

    private static Dictionary<string, string> Fault(string point) => new() { ["IK_FAULT_INJECTION"] = point + ":exit" };
}
