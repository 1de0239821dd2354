using System.Globalization;
using IndexKeeper.Tests.WorkQueue;

namespace IndexKeeper.Benchmarks;

/// <summary>
/// What the work queue costs while nothing happens (docs/work-queue.md, "Notifications"): the CPU share of an idle
/// <c>worker</c> (an empty queue), and of a coordinator (<c>run</c>) whose published jobs no worker takes, each at
/// the default settings on a throwaway PostgreSQL. With <c>IK_BENCH_BASELINE</c> naming another build's
/// indexkeeper.dll (main's, say) both builds are measured, alternated in rounds, so their ratio is of one sitting.
/// </summary>
public sealed class WorkQueueIdleBenchmark : IBenchmark
{
    public string Name => "workqueue-idle";

    public void Run(BenchmarkContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        var work = context.WorkDirectory;
        var roots = EmbedBenchmark.SmokeStore(Path.Combine(work, "store"));
        string[] encoder = ["--Encoder:Name=hashed-terms"];
        var rootArgs = roots.SelectMany(r => new[] { "--root", r.Path }).ToArray();
        var scanned = Path.Combine(work, "scanned");
        CliJson.Run(work, ["scan", "--index", scanned, .. rootArgs, .. encoder, "--json"]);

        var baseline = Environment.GetEnvironmentVariable("IK_BENCH_BASELINE");
        List<(string Name, string? Program)> builds = string.IsNullOrEmpty(baseline) ? [("this build", null)] : [("baseline", baseline), ("this build", null)];
        var (settle, length) = context.Quick ? (TimeSpan.FromSeconds(3), TimeSpan.FromSeconds(10)) : (TimeSpan.FromSeconds(10), TimeSpan.FromSeconds(60));
        using var server = new PostgresServer();
        var figures = builds.ToDictionary(b => b.Name, _ => (Worker: new List<double>(), Coordinator: new List<double>()));
        var run = 0;
        for (var round = 0; round < (context.Quick ? 1 : 2); round++)
        {
            foreach (var (name, program) in builds)
            {
                var folder = Path.Combine(work, $"run-{run++}");
                Directory.CreateDirectory(folder);
                var worker = IdleWorker(server, folder, rootArgs, encoder, program, settle, length);
                var coordinator = CoordinatorWithJobsOut(server, scanned, folder, rootArgs, encoder, program, settle, length);
                context.Note(string.Create(CultureInfo.InvariantCulture, $"round {round + 1}, {name}: idle worker {worker:P2}, coordinator with jobs out {coordinator:P2} of a core (load {Measure.LoadAverage():0.0})"));
                figures[name].Worker.Add(worker);
                figures[name].Coordinator.Add(coordinator);
            }
        }

        foreach (var (name, (worker, coordinator)) in figures)
        {
            context.Report($"{name}: idle worker, share of a core", worker.Average(), "share");
            context.Report($"{name}: coordinator with jobs out and no worker, share of a core", coordinator.Average(), "share");
        }
    }

    /// <summary>A worker of default settings on an empty queue: its CPU share once it has settled.</summary>
    private static double IdleWorker(PostgresServer server, string folder, string[] rootArgs, string[] encoder, string? program, TimeSpan settle, TimeSpan length)
    {
        var database = server.CreateDatabase();
        using var worker = new WorkerProcess(folder, [.. rootArgs, .. encoder, $"--Queue:Connection={server.Connection(database)}", $"--Queue:PasswordFile={server.PasswordFile}"], program);
        Thread.Sleep(settle);
        var before = worker.CpuSeconds;
        Thread.Sleep(length);
        var share = (worker.CpuSeconds - before) / length.TotalSeconds;
        worker.Stop();
        return share;
    }

    /// <summary>A coordinator of default settings that has published its queue, with no worker to take it: its CPU share once settled.</summary>
    private static double CoordinatorWithJobsOut(PostgresServer server, string scanned, string folder, string[] rootArgs, string[] encoder, string? program, TimeSpan settle, TimeSpan length)
    {
        var database = server.CreateDatabase();
        WorkQueueBenchmark.Copy(scanned, Path.Combine(folder, "index"));
        using var daemon = DaemonProcess.Start(folder, [.. rootArgs, .. encoder, $"--Queue:Connection={server.Connection(database)}", $"--Queue:PasswordFile={server.PasswordFile}"], program);
        try
        {
            Thread.Sleep(settle);
            if (server.Scalar(database, "SELECT count(*) FROM indexkeeper_queue.jobs") == 0)
            {
                throw new InvalidOperationException("the coordinator published no job");
            }

            return daemon.Sample(() => false, length).CpuShare;
        }
        finally
        {
            daemon.Stop();
        }
    }
}
