using System.Text.Json;
using IndexKeeper.Service.WorkQueue;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.WorkQueue;

/// <summary>
/// <c>plan</c> without a daemon asks PostgreSQL for the live workers (Queue:Connection set) and counts them,
/// in read-only transactions: on a database without the queue's tables it creates nothing.
/// </summary>
[Collection(PostgresCollection.Name)]
public sealed class PlanWorkersTests(PostgresServer server)
{
    [Fact]
    public void Plan_without_a_daemon_counts_the_live_workers_and_creates_nothing()
    {
        using var store = new QueueStore(server);

        // A worker that finds nothing to do and stops; with a heartbeat of ten minutes it counts as live for thirty.
        using (var worker = new RunningWorker(store.Temp.Path, [.. store.WorkerArgs("planned", "--Queue:HeartbeatSeconds=600", "--Queue:LeaseSeconds=1800"), "--until-idle"]))
        {
            Assert.Equal(0, worker.WaitForExit(TimeSpan.FromMinutes(2)));
        }

        Assert.Equal(1, Plan(store, store.CoordinatorArgs).GetProperty("liveWorkers").GetInt32());

        // A database the work queue never used: no worker, and no table made by looking.
        var empty = server.CreateDatabase();
        Assert.Equal(0, Plan(store, ["--root", "docs", "--Queue:Connection=" + server.Connection(empty), "--Queue:PasswordFile=" + server.PasswordFile]).GetProperty("liveWorkers").GetInt32());
        Assert.Equal(0, server.Scalar(empty, $"SELECT count(*) FROM information_schema.schemata WHERE schema_name = '{QueueSchema.Name}'"));
    }

    private static JsonElement Plan(QueueStore store, string[] settings)
    {
        var result = CliRunner.Run(store.Temp.Path, ["plan", "--index", store.ReferenceIndex, .. settings, "--json"]);
        Assert.True(result.ExitCode == 0, result.Stderr);
        return JsonDocument.Parse(result.Stdout).RootElement.Clone();
    }
}
