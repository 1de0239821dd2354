using IndexKeeper.Tests.Daemon;

namespace IndexKeeper.Tests.WorkQueue;

/// <summary>
/// The status page shows the work queue's workers (as <c>status</c> and /metrics do): in Debian's headless
/// chromium, a worker of the active encoder with its pages, and one of another encoder id marked as taking no job.
/// </summary>
[Collection(PostgresCollection.Name)]
public sealed class StatusPageWorkersTests(PostgresServer server)
{
    [StatusPageBrowserTests.ChromiumFact]
    public void Workers_their_encoders_and_pages_show_on_the_status_page()
    {
        using var store = new QueueStore(server);
        using var daemon = RunningDaemon.Start(store.Temp.Path, store.CoordinatorArgs);
        using var one = new RunningWorker(store.Temp.Path, store.WorkerArgs("one"));
        using var stranger = new RunningWorker(store.Temp.Path, store.WorkerArgs("stranger", "--Encoder:Dimensions=256"));
        QueueStore.WaitUntilComplete(daemon);
        daemon.WaitUntil("both workers are in the status with every page", () => daemon.GetJson("/api/daemon").TryGetProperty("workQueue", out var q)
            && q.GetProperty("workers").GetArrayLength() == 2 && q.GetProperty("workers").EnumerateArray().Sum(w => w.GetProperty("pagesDone").GetInt64()) == QueueStore.Pages);

        var dom = StatusPageBrowserTests.RunChromium(store.Temp, ["--dump-dom", daemon.Client.BaseAddress!.ToString()], out _);
        Assert.Contains("data-rendered=\"1\"", dom, StringComparison.Ordinal);
        Assert.DoesNotContain("data-errors", dom, StringComparison.Ordinal);
        Assert.Matches("<tr><td>one</td>[^\n]*<td>" + QueueStore.Pages + " / 0</td>", dom);
        Assert.Matches("<tr><td>stranger</td>[^\n]*class=\"other-encoder\"[^\n]*<td>0 / 0</td>", dom);
        Assert.Contains(" committed, 0 rejected.", dom, StringComparison.Ordinal);
        one.Terminate();
        stranger.Terminate();
        Assert.Equal(0, daemon.Terminate(TimeSpan.FromSeconds(60)));
    }
}
