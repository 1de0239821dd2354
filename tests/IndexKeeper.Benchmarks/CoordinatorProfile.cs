using IndexKeeper.Core.Queue;
using IndexKeeper.Demo;
using IndexKeeper.Service.Application;
using IndexKeeper.Service.Configuration;
using IndexKeeper.Service.WorkQueue;
using IndexKeeper.Tests.WorkQueue;
using Microsoft.Extensions.Logging.Abstractions;

namespace IndexKeeper.Benchmarks;

/// <summary>
/// Where the coordinator's CPU per page goes, without the daemon loop around it: the stages of its turn over
/// the work queue (docs/work-queue.md, "The coordinator") run in this process one after another, each timed
/// by this process's CPU, with a worker (hashed-terms, in this process, untimed) encoding in between. The
/// stages are the same calls <c>RemoteEmbedding</c> makes; the daemon's own tick (samples, serving view,
/// a look at the queue a second) is paid by time and is what the out-of-process runs add.
/// <paramref name="commitBatch"/> is how many handed-back results one commit takes at most: the daemon's
/// limit (four encoder batches) by default, or fewer to see what a commit costs when results trickle in.
/// </summary>
internal static class CoordinatorProfile
{
    public static void Run(BenchmarkContext context, PostgresServer server, IReadOnlyList<DemoRoot> roots, string directory, int? commitBatch = null, string label = "in process")
    {
        var database = server.CreateDatabase();
        var overrides = new List<string>
        {
            "Detect:SettleSeconds=0", "Encoder:Name=hashed-terms",
            $"Queue:Connection={server.Connection(database)}", $"Queue:PasswordFile={server.PasswordFile}", "Queue:HeartbeatSeconds=1",
        };
        for (var i = 0; i < roots.Count; i++)
        {
            overrides.Add($"Roots:{i}:Name={roots[i].Name}");
            overrides.Add($"Roots:{i}:Path={roots[i].Path}");
        }

        var options = OptionsLoader.Load(new ConfigurationSources(null, Path.Combine(directory, "index"), [], overrides));
        using var composed = IndexComposition.Open(options, "benchmark coordinator");
        var index = composed.Index;
        _ = index.Store;
        composed.Get<ScanOperation>().Walk("benchmark", composed.Settings.Scan.Roots, CancellationToken.None);
        using var source = QueueDatabase.Create(options.Queue, "benchmark coordinator");
        QueueSchema.Ensure(source, migrate: true);
        var jobs = new JobTable(source);
        var publish = new PublishJobsOperation(index);
        var commit = new CommitResultsOperation(index, RetryPolicy.Default);
        using var worker = new RemoteWorker(options, NullLogger.Instance);
        var published = new HashSet<string>(StringComparer.Ordinal);
        var stages = new Dictionary<string, (double Cpu, double Wall, int Calls)>();
        void Time(string stage, Action run)
        {
            var (wall, cpu) = Measure.Once(run);
            var (c, w, n) = stages.GetValueOrDefault(stage);
            stages[stage] = (c + cpu, w + wall, n + 1);
        }

        var limit = commitBatch ?? Math.Max(1, composed.Settings.EmbedBatchSize * 4);
        var committed = 0L;
        while (true)
        {
            var now = DateTime.UtcNow;
            Time("queue due count (each turn)", () => index.Catalog.Queue.Due(now));
            var count = 0;
            Time("publish", () => count = publish.Run(jobs, published, options.Queue.PublishAhead, QueuePriority.Canary, now).Count);
            if (count == 0)
            {
                break;
            }

            worker.Run(untilIdle: true, CancellationToken.None);
            while (true)
            {
                IReadOnlyList<FinishedJob> finished = [];
                Time("read results", () => finished = jobs.Finished(limit).Taken);
                if (finished.Count == 0)
                {
                    break;
                }

                CommitOutcome outcome = null!;
                Time("check and commit", () => outcome = commit.Run(finished, DateTime.UtcNow));
                Time("delete jobs", () => jobs.Delete(finished.Select(f => f.Job).ToList()));
                published.ExceptWith(finished.Select(f => f.Job.PageKey));
                committed += outcome.Committed;
            }
        }

        Time("queue figures (each look)", () => jobs.Counts());
        if (committed == 0 || index.Catalog.Queue.Due(DateTime.UtcNow).Total != 0)
        {
            throw new InvalidOperationException($"the profile committed {committed} page(s) and left the queue not empty");
        }

        context.Report($"{label}: pages committed", committed, "pages");
        context.Report($"{label}: results per commit (mean)", (double)committed / stages["check and commit"].Calls, "pages");
        var total = 0.0;
        foreach (var (stage, (cpu, wall, calls)) in stages)
        {
            context.Report($"{label}: {stage}, CPU per page", cpu / committed * 1000, "ms");
            context.Note(FormattableString.Invariant($"{label}: {stage}: {calls} call(s), {cpu * 1000:0} ms CPU, {wall * 1000:0} ms wall"));
            total += stage.Contains("each look", StringComparison.Ordinal) ? 0 : cpu;
        }

        context.Report($"{label}: coordinator CPU per page, all stages", total / committed * 1000, "ms");
    }
}
