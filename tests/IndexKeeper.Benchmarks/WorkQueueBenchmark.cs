using System.Diagnostics;
using System.Globalization;
using System.Text.Json;
using IndexKeeper.Tests.WorkQueue;

namespace IndexKeeper.Benchmarks;

/// <summary>
/// Embedding through the work queue (docs/work-queue.md) on this machine: the same queued pages embedded by
/// one local <c>sync</c>, then by a coordinator (<c>run</c>) with 1 and with 2 <c>worker</c> processes
/// (intra-op threads 1 each) over a throwaway PostgreSQL; pages per second, the coordinator's CPU per page,
/// PostgreSQL transactions per page, and a projection for N machines. Every run starts from the same
/// scanned index (pages queued, reading done), so the figures are the embedding alone. Each worker is stopped
/// (SIGTERM) as soon as the run is done and logs its time by stage; the figures per worker (pages per
/// encoder-second, share of its time outside the encoder, and each stage per page) transfer to a loaded machine
/// better than the rates do.
/// </summary>
public sealed class WorkQueueBenchmark : IBenchmark
{
    public string Name => "workqueue";

    public void Run(BenchmarkContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        var work = context.WorkDirectory;

        // IK_WORKQUEUE_FAST_ONLY=RATE: only the fast-worker run, scaled against RATE pages/s a machine (e.g. to profile it).
        if (Environment.GetEnvironmentVariable("IK_WORKQUEUE_FAST_ONLY") is { Length: > 0 } fastOnly)
        {
            using var alone = new PostgresServer();
            Fleet(context, alone, work, double.Parse(fastOnly, CultureInfo.InvariantCulture));
            return;
        }

        var roots = context.Quick ? EmbedBenchmark.SmokeStore(Path.Combine(work, "store")) : EmbedBenchmark.DemoRoots(context, Path.Combine(work, "store"));
        string[] encoder = context.Quick ? ["--Encoder:Name=hashed-terms"] : ["--Encoder:Name=minilm", "--Encoder:IntraOpThreads=1"];
        var rootArgs = roots.SelectMany(r => new[] { "--root", r.Path }).ToArray();
        context.Note($"encoder: {string.Join(' ', encoder)}");

        // The scanned index every run starts from: pages read and queued, nothing embedded.
        var scanned = Path.Combine(work, "scanned");
        var scan = CliJson.Run(work, ["scan", "--index", scanned, .. rootArgs, .. encoder, "--json"]);
        var pages = scan.GetProperty("pagesNew").GetInt64();
        context.Report("pages queued (distinct page keys)", pages, "pages");

        var local = Copy(scanned, Path.Combine(work, "local"));
        var clock = Stopwatch.StartNew();
        var sync = CliJson.Run(work, ["sync", "--index", local, .. rootArgs, .. encoder, "--json"]);
        var localSeconds = clock.Elapsed.TotalSeconds;
        var localRate = sync.GetProperty("pagesEmbedded").GetInt64() / localSeconds;
        context.Report("local sync: pages embedded per second", localRate, "pages/s");
        context.Report("local sync: wall time per page", localSeconds / pages * 1000, "ms");

        using var server = new PostgresServer();
        var rates = new Dictionary<int, double>();
        foreach (var workers in new[] { 1, 2 })
        {
            var run = Distributed(context, server, scanned, work, rootArgs, encoder, workers, pages, $"{workers} worker(s)");
            rates[workers] = run.Rate;
            context.Report($"{workers} worker(s): each worker's pages per encoder-second (mean)", run.EncoderRate, "pages/s");
            if (workers == 2)
            {
                // Ten machines like this one, two workers each: the coordinator's share of one core, scaled from this rate.
                context.Report("projection: coordinator busy share with 10 such machines", 10 * run.Rate * run.NetMsPerPage / 1000, "share");
            }
        }

        context.Report("2 workers against 1", rates[2] / rates[1], "x");
        context.Report("1 worker against local sync", rates[1] / localRate, "x");
        Fleet(context, server, work, rates[2]);
    }

    /// <summary>
    /// The coordinator at the page rate of several machines, measured rather than scaled: two workers with the
    /// hashed-terms encoder (about a millisecond a page instead of a quarter second) hand pages back as fast as
    /// they read them, so the coordinator commits in a minute what several machines of <c>minilm</c> workers would.
    /// Its vectors have the same size (128 dimensions, one a word or token) and its pages about as many (480 words
    /// a page: the index bytes per page of both runs are reported), so the coordinator's work per page is alike;
    /// per turn it is not (more results a commit, more jobs a publication), which is what many machines bring, and
    /// why a projection scaled from two workers' rate overstates the coordinator's share.
    /// </summary>
    private static void Fleet(BenchmarkContext context, PostgresServer server, string work, double machineRate)
    {
        var store = Path.Combine(work, "fleet-store");
        Directory.CreateDirectory(store);
        var (documents, pagesEach) = context.Quick ? (8, 3) : (150, 20);
        for (var d = 0; d < documents; d++)
        {
            File.WriteAllBytes(Path.Combine(store, $"report-{d:000}.pdf"), GeneratedReport.Build(d, new int[pagesEach], wordsPerPage: 480));
        }

        string[] encoder = ["--Encoder:Name=hashed-terms"];
        string[] rootArgs = ["--root", store];
        var scanned = Path.Combine(work, "fleet-scanned");
        var pages = CliJson.Run(work, ["scan", "--index", scanned, .. rootArgs, .. encoder, "--json"]).GetProperty("pagesNew").GetInt64();
        context.Report("fast workers: pages queued", pages, "pages");

        // Two fast workers give the rate of about twenty machines, one fast worker about half of it: the coordinator is
        // measured at both rates, the lower one near ten machines' without any scaling.
        foreach (var workers in new[] { 1, 2 })
        {
            var label = $"{workers} fast worker(s)";
            var run = Distributed(context, server, scanned, work, rootArgs, encoder, workers, pages, label);
            var machines = run.Rate / machineRate;
            context.Report($"{label}: machines like this one (2 minilm workers) the page rate stands for", machines, "machines");
            context.Report($"{label}: coordinator busy share during the run", run.CpuShare, "share");
            context.Report($"{label}: coordinator busy share during the run's second half", run.SecondHalfShare, "share");

            // Scaled to ten machines from the second half's busy share at this run's rate: linear in pages, its idle
            // cost (figures, heartbeats) kept once. A lower rate gathers fewer results a commit, so scaling down from a
            // higher rate flatters the coordinator; the run nearest ten machines' rate is the one to read.
            context.Report(
                $"{label}: projection, coordinator busy share with 10 such machines",
                run.IdleShare + ((run.SecondHalfShare - run.IdleShare) * 10 / machines),
                "share");
        }
    }

    /// <summary>One run's figures: pages/s, the coordinator's busy share (whole run, second half, idle after), its CPU per page beyond idle.</summary>
    private readonly record struct RunFigures(double Rate, double CpuShare, double SecondHalfShare, double IdleShare, double NetMsPerPage, double EncoderRate);

    private static RunFigures Distributed(
        BenchmarkContext context, PostgresServer server, string scanned, string work, string[] rootArgs, string[] encoder, int workers, long pages, string label)
    {
        var database = server.CreateDatabase();
        string[] queue = [$"--Queue:Connection={server.Connection(database)}", $"--Queue:PasswordFile={server.PasswordFile}", "--Queue:HeartbeatSeconds=0.5", "--Queue:LeaseSeconds=60"];
        var folder = Path.Combine(work, label.Replace(' ', '-').Replace("(", string.Empty).Replace(")", string.Empty));
        Directory.CreateDirectory(folder);
        Copy(scanned, Path.Combine(folder, "index"));
        using var daemon = DaemonProcess.Start(folder, [.. rootArgs, .. encoder, .. queue, "--Daemon:SampleSeconds=10"]);

        var transactionsBefore = server.Scalar(database, "SELECT xact_commit FROM pg_stat_database WHERE datname = current_database()");
        var processes = Enumerable.Range(0, workers).Select(i => new WorkerProcess(folder, [.. rootArgs, .. encoder, .. queue, $"--Queue:WorkerName=w{i}"])).ToList();
        try
        {
            // Done when the workers' heartbeats count every page and no job is left: committed and deleted. Looked
            // at once a second; the look's own two transactions a time are taken off the count below.
            var looks = 0;
            var lastLook = Stopwatch.StartNew();
            var clock = Stopwatch.StartNew();
            // The coordinator's CPU from the look at which half the pages were handed back: the second half of a run is
            // past the daemon's first-use costs (JIT compilation of the commit path, tiered recompilation), which a
            // coordinator that runs for weeks pays once, not per page.
            (double Cpu, double Seconds, long Done)? half = null;
            var usage = daemon.Sample(
                () =>
                {
                    if (lastLook.Elapsed < TimeSpan.FromSeconds(1))
                    {
                        return false;
                    }

                    lastLook.Restart();
                    processes.ForEach(p => p.ThrowIfExited());
                    looks++;
                    var done = server.Scalar(database, "SELECT coalesce(sum(pages_done), 0) FROM indexkeeper_queue.workers");
                    if (half is null && done >= pages / 2)
                    {
                        half = (daemon.CpuSeconds, clock.Elapsed.TotalSeconds, done);
                    }

                    return done >= pages && server.Scalar(database, "SELECT count(*) FROM indexkeeper_queue.jobs") == 0;
                },
                TimeSpan.FromHours(1));
            var (cpuAtEnd, secondsAtEnd) = (daemon.CpuSeconds, clock.Elapsed.TotalSeconds);
            var transactions = server.Scalar(database, "SELECT xact_commit FROM pg_stat_database WHERE datname = current_database()") - transactionsBefore - (2 * looks);
            using var connection = server.Admin(database);
            using var command = connection.CreateCommand();
            command.CommandText = "SELECT avg(pages_done / nullif(encoder_seconds, 0)) FROM indexkeeper_queue.workers";
            var encoderRate = Convert.ToDouble(command.ExecuteScalar(), CultureInfo.InvariantCulture);
            var status = daemon.Get("/api/status");
            var live = status.GetProperty("liveVectorSets").GetInt64();
            if (live != pages)
            {
                throw new InvalidOperationException($"{live} live vector sets for {pages} pages");
            }

            // Stopped at once, so their time by stage is the run's (its waits included: for a publication, for the next job).
            var stages = processes.Select(p => p.Stop()).ToList();
            ReportStages(context, label, stages, pages);

            // The coordinator's own idle cost afterwards (loop tick, samples, a look at the queue), the workers stopped, to subtract.
            var idle = daemon.Sample(() => false, TimeSpan.FromSeconds(context.Quick ? 5 : 20));
            context.Note(FormattableString.Invariant($"{label}: {usage.Seconds:0.0} s, coordinator {usage.CpuShare:P1} of a core (idle after: {idle.CpuShare:P1}), peak {usage.PeakRssMegabytes:0} MB"));
            context.Report($"{label}: coordinator CPU per page, idle cost included", usage.CpuShare * usage.Seconds / pages * 1000, "ms");
            var net = Math.Max(0, usage.CpuShare - idle.CpuShare) * usage.Seconds / pages * 1000;
            var secondHalfShare = usage.CpuShare;
            if (half is { } h && pages > h.Done)
            {
                var secondHalf = secondsAtEnd - h.Seconds;
                secondHalfShare = (cpuAtEnd - h.Cpu) / secondHalf;
                context.Report($"{label}: coordinator CPU per page, second half of the run, idle cost included", (cpuAtEnd - h.Cpu) / (pages - h.Done) * 1000, "ms");
                context.Report($"{label}: coordinator CPU per page, second half of the run, beyond its idle cost", Math.Max(0, cpuAtEnd - h.Cpu - (idle.CpuShare * secondHalf)) / (pages - h.Done) * 1000, "ms");
            }

            var rate = pages / usage.Seconds;
            context.Report($"{label}: pages embedded per second", rate, "pages/s");
            context.Report($"{label}: coordinator CPU per page beyond its idle cost", net, "ms");
            context.Report($"{label}: PostgreSQL transactions per page (coordinator and workers)", (double)transactions / pages, "tx");
            context.Report($"{label}: index bytes on disk per page", status.GetProperty("bytesOnDisk").GetInt64() / (double)pages, "B");
            return new RunFigures(rate, usage.CpuShare, secondHalfShare, idle.CpuShare, net, encoderRate);
        }
        finally
        {
            processes.ForEach(p => p.Dispose());
            daemon.Stop();
        }
    }

    /// <summary>
    /// The workers' time by stage (their stop line, <c>WorkerStages</c>), summed over the workers: the share of their
    /// time outside the encoder, and each stage in ms per page embedded.
    /// </summary>
    private static void ReportStages(BenchmarkContext context, string label, List<Dictionary<string, double>> stages, long pages)
    {
        var sums = stages.SelectMany(s => s).GroupBy(p => p.Key).ToDictionary(g => g.Key, g => g.Sum(p => p.Value));
        context.Note($"{label}, seconds by stage summed over the workers: " + string.Join(", ", sums.Select(p => FormattableString.Invariant($"{p.Key} {p.Value:0.00}"))));
        context.Report($"{label}: share of the workers' time outside the encoder", 1 - (sums["encode"] / sums["total"]), "share");
        context.Report($"{label}: share of the workers' time outside the encoder, waits for jobs left out", 1 - (sums["encode"] / (sums["total"] - sums["wait"])), "share");
        foreach (var stage in new[] { "hash", "read", "claim", "write", "handback", "wait", "other" })
        {
            context.Report($"{label}: worker {stage} per page", sums[stage] / pages * 1000, "ms");
        }
    }

    /// <summary>A copy of an index folder (closed): every run starts from the same queue.</summary>
    internal static string Copy(string from, string to)
    {
        foreach (var file in Directory.EnumerateFiles(from, "*", SearchOption.AllDirectories))
        {
            var target = Path.Combine(to, Path.GetRelativePath(from, file));
            Directory.CreateDirectory(Path.GetDirectoryName(target)!);
            File.Copy(file, target);
        }

        return to;
    }
}
