using System.Diagnostics;
using System.Globalization;
using System.Text;
using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Index;
using IndexKeeper.Core.Search;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Benchmarks;

/// <summary>
/// The daemon on an index of 10,000 and 100,000 generated pages (the serving benchmark's pages: hashed-term
/// encoder, d = 128, 60–200 words a page), issue 13: its CPU while idle (process CPU seconds over minutes, from
/// /proc), its first search after a start against warm ones, and search throughput of 8 concurrent clients
/// with no writer and while a sync commits (new text documents dropped into a root), in one run, with every
/// refused search counted. Generated indexes are kept under the temp folder to rerun
/// (<c>indexkeeper-bench-cache/idle-N</c>); the documents the writer adds go to a root emptied at each start.
/// </summary>
public sealed class IdleBenchmark : IBenchmark
{
    private const int Clients = 8;

    public string Name => "idle";

    public void Run(BenchmarkContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        foreach (var pages in Sizes(context, "IK_IDLE_PAGES"))
        {
            Size(context, pages);
        }
    }

    /// <summary>The page counts to run: those of <paramref name="variable"/> (comma-separated), else 1,000 quick or 10,000 and 100,000.</summary>
    internal static int[] Sizes(BenchmarkContext context, string variable) =>
        Environment.GetEnvironmentVariable(variable) is { } asked
            ? asked.Split(',').Select(s => int.Parse(s, CultureInfo.InvariantCulture)).ToArray()
            : context.Quick ? [1_000] : [10_000, 100_000];

    /// <summary>The generated index of <paramref name="pages"/> pages, written the first time; returns its folder and the size's short name.</summary>
    internal static (string Cache, string Name) Generated(BenchmarkContext context, int pages)
    {
        var name = $"{pages / 1000.0:0.#}k";
        var cache = Path.Combine(Path.GetTempPath(), "indexkeeper-bench-cache", $"idle-{pages}");
        Generate(context, cache, pages, name);
        return (cache, name);
    }

    private static void Size(BenchmarkContext context, int pages)
    {
        var (cache, name) = Generated(context, pages);
        var queries = File.ReadAllLines(Path.Combine(cache, "queries.txt"));
        var incoming = Path.Combine(cache, "incoming");
        if (Directory.Exists(incoming))
        {
            Directory.Delete(incoming, recursive: true);
        }

        Directory.CreateDirectory(incoming);
        // IK_IDLE_REBUILD_VIEW=1: drop the kept serving view (a derived file, rebuilt from the segments) to measure its build again.
        var view = Path.Combine(cache, "index", ServingViewFile.Folder);
        if (Environment.GetEnvironmentVariable("IK_IDLE_REBUILD_VIEW") == "1" && Directory.Exists(view))
        {
            Directory.Delete(view, recursive: true);
        }

        var building = !Directory.Exists(view);
        // No canaries: the generated pages have no document to read them again from.
        // IK_IDLE_CANDIDATES: the daemon's Query:Candidates (all by default; centroids trains and builds the lists at the first start).
        string[] args = ["--root", "incoming", "--encoder", "hashed-terms", "--Schedule:Windows:0=Mon-Sun 00:00-24:00", "--Detect:SettleSeconds=1", "--Drift:CanaryPages=0",
            "--Query:Candidates=" + (Environment.GetEnvironmentVariable("IK_IDLE_CANDIDATES") ?? "all")];
        using var daemon = DaemonProcess.Start(cache, args);
        daemon.WaitUntil(TimeSpan.FromMinutes(60), () =>
        {
            var status = daemon.Get("/api/status");
            return status.GetProperty("queued").GetInt64() == 0 && daemon.Get("/api/daemon").TryGetProperty("lastFullWalk", out var at) && at.ValueKind == System.Text.Json.JsonValueKind.String;
        }, 1000);
        var started = daemon.CpuSeconds;
        context.Note($"{name}: daemon up and its start-up walk done after {started:0.0} CPU s (load {Measure.LoadAverage():0.0})");
        // The warm-up search beside the walk builds the view (or reads its file); searches before its end wait for it.
        var warming = Stopwatch.StartNew();
        daemon.WaitUntil(TimeSpan.FromMinutes(60), () => daemon.Warmed, 500);
        context.Report($"{name}: warm-up done after the walk, wall (load {Measure.LoadAverage():0.0}); daemon CPU so far {daemon.CpuSeconds:0} s", warming.Elapsed.TotalSeconds, "s");
        context.Report($"{name}: peak resident memory through the start{(building ? " and the view build" : " (view read from disk)")} (VmHWM)", daemon.PeakRssSinceStartMegabytes, "MiB");

        // The first search after the start, then warm ones (each query once more). This process's HTTP client was used
        // by the waits above, so its own first request is not in the figure; the daemon's own time for each search is
        // read from its duration histogram's sum in /metrics as well.
        var served = ServedSeconds(daemon);
        var clock = Stopwatch.StartNew();
        Search(daemon, SearchPath(queries[0]));
        var first = clock.Elapsed.TotalMilliseconds;
        var firstServed = (ServedSeconds(daemon) - served) * 1000;
        var warm = new List<double>();
        var warmServed = new List<double>();
        foreach (var query in queries.Take(20))
        {
            served = ServedSeconds(daemon);
            clock.Restart();
            Search(daemon, SearchPath(query));
            warm.Add(clock.Elapsed.TotalMilliseconds);
            warmServed.Add((ServedSeconds(daemon) - served) * 1000);
        }

        var warmMedian = SearchBenchmark.Percentile([.. warm.Order()], 0.50);
        var warmServedMedian = SearchBenchmark.Percentile([.. warmServed.Order()], 0.50);
        context.Report($"{name}: first search after the start, wall (load {Measure.LoadAverage():0.0})", first, "ms");
        context.Report($"{name}: warm search p50, wall", warmMedian, "ms");
        context.Report($"{name}: first / warm p50", first / warmMedian, "x");
        context.Report($"{name}: first search after the start, the daemon's own time", firstServed, "ms");
        context.Report($"{name}: warm search p50, the daemon's own time", warmServedMedian, "ms");
        context.Report($"{name}: first / warm p50, the daemon's own time", firstServed / warmServedMedian, "x");

        // Idle: long enough to include the five-minute look at the segment files.
        var idleSeconds = context.Quick ? 20 : 330;
        var loadBefore = Measure.LoadAverage();
        var idle = daemon.Sample(() => false, TimeSpan.FromSeconds(idleSeconds));
        context.Report($"{name}: idle CPU seconds over {idleSeconds} s (load {loadBefore:0.0} → {Measure.LoadAverage():0.0})", idle.CpuShare * idle.Seconds, "s");
        context.Report($"{name}: idle CPU share of one core", idle.CpuShare * 100, "%");
        context.Report($"{name}: idle resident memory", idle.PeakRssMegabytes, "MiB");

        var seconds = context.Quick ? 5 : 30;
        var quiet = Throughput(daemon, queries, seconds);
        context.Report($"{name}: 8 clients, no writer: searches/s (load {Measure.LoadAverage():0.0})", quiet.Completed / quiet.Seconds, "1/s");
        context.Report($"{name}: 8 clients, no writer: refused", quiet.Refused, "searches");

        // The writer: text documents of several pages each, dropped at once; the daemon settles, scans, embeds and commits in batches.
        var pagesBefore = daemon.Get("/api/status").GetProperty("pages").GetInt64();
        var cpuBefore = daemon.CpuSeconds;
        WriteDocuments(incoming, context.Quick ? 40 : 400);
        var busy = Throughput(daemon, queries, seconds);
        var status = daemon.Get("/api/status");
        var added = status.GetProperty("pages").GetInt64() - pagesBefore;
        context.Report($"{name}: 8 clients during a sync: searches/s (load {Measure.LoadAverage():0.0})", busy.Completed / busy.Seconds, "1/s");
        context.Report($"{name}: 8 clients during a sync: refused", busy.Refused, "searches");
        context.Report($"{name}: pages the sync added during the window", added, "pages");
        context.Report($"{name}: daemon CPU during the window with the writer", daemon.CpuSeconds - cpuBefore, "s");
        context.Report($"{name}: searches/s with the writer / without", busy.Completed / busy.Seconds / (quiet.Completed / quiet.Seconds), "x");
        context.Report($"{name}: peak resident memory from the start through serving and the sync (VmHWM)", daemon.PeakRssSinceStartMegabytes, "MiB");

        // The writer's documents go again before the stop, so the next run starts from the generated index as it was:
        // otherwise its start-up walk deletes them and its first search pays for that commit, not for a first search.
        // The files only: a root that went away keeps its documents for a grace time.
        foreach (var file in Directory.EnumerateFiles(incoming))
        {
            File.Delete(file);
        }

        daemon.WaitUntil(TimeSpan.FromMinutes(10), () => daemon.Get("/api/status") is var now && now.GetProperty("pages").GetInt64() == pagesBefore && now.GetProperty("queued").GetInt64() == 0, 1000);
        daemon.Stop();
    }

    private static string SearchPath(string query) => "/api/search?k=10&q=" + Uri.EscapeDataString(query);

    private static void Search(DaemonProcess daemon, string path)
    {
        var status = daemon.StatusOf(path);
        if (status != 200)
        {
            throw new InvalidOperationException($"{path} answered {status}");
        }
    }

    /// <summary>
    /// Seconds the daemon has spent answering searches so far: the sum of its search duration histogram (Prometheus text
    /// format). The exporter answers a scrape from its last one for 300 ms (its default cache), so this waits that out.
    /// </summary>
    private static double ServedSeconds(DaemonProcess daemon)
    {
        Thread.Sleep(400);
        return daemon.Text("/metrics").Split('\n')
            .Where(line => line.StartsWith("indexkeeper_search_duration_seconds_sum", StringComparison.Ordinal))
            .Sum(SampleValue);
    }

    /// <summary>A sample line's value: the token after the name and its labels (a timestamp may follow; Prometheus text exposition format).</summary>
    private static double SampleValue(string line)
    {
        var afterName = line.Contains('}', StringComparison.Ordinal) ? line[(line.LastIndexOf('}') + 1)..] : line[line.IndexOf(' ', StringComparison.Ordinal)..];
        return double.Parse(afterName.Trim().Split(' ')[0], CultureInfo.InvariantCulture);
    }

    private sealed record Load(long Completed, long Refused, double Seconds);

    /// <summary>Eight clients, each searching in a loop for the time given; a non-200 answer counts as refused.</summary>
    private static Load Throughput(DaemonProcess daemon, string[] queries, int seconds)
    {
        long completed = 0, refused = 0;
        var clock = Stopwatch.StartNew();
        var until = TimeSpan.FromSeconds(seconds);
        var clients = Enumerable.Range(0, Clients).Select(c => new Thread(() =>
        {
            for (var i = c; clock.Elapsed < until; i += Clients)
            {
                if (daemon.StatusOf("/api/search?k=10&q=" + Uri.EscapeDataString(queries[i % queries.Length])) == 200)
                {
                    Interlocked.Increment(ref completed);
                }
                else
                {
                    Interlocked.Increment(ref refused);
                }
            }
        })).ToList();
        clients.ForEach(t => t.Start());
        clients.ForEach(t => t.Join());
        return new Load(completed, refused, clock.Elapsed.TotalSeconds);
    }

    /// <summary>Plain-text documents of an invented pumping authority, each a few pages long (docs/readers.md paginates text).</summary>
    private static void WriteDocuments(string folder, int count)
    {
        string[] words = ["sluice", "weir", "culvert", "penstock", "sump", "impeller", "gland", "baffle", "outfall", "siphon", "screen", "valve", "chamber", "float", "telemetry"];
        var random = new Random(count);
        for (var d = 0; d < count; d++)
        {
            var text = new StringBuilder();
            for (var line = 0; line < 150; line++)
            {
                text.AppendLine(string.Join(' ', Enumerable.Range(0, 10).Select(_ => words[random.Next(words.Length)] + random.Next(100).ToString(CultureInfo.InvariantCulture))));
            }

            var path = Path.Combine(folder, $"log-{d:D4}.txt");
            File.WriteAllText(path, text.ToString());
            File.SetLastWriteTimeUtc(path, DateTime.UtcNow.AddMinutes(-5));
        }
    }

    /// <summary>Writes the index once (the serving benchmark's way) and keeps it; a complete one is reused.</summary>
    private static void Generate(BenchmarkContext context, string cache, int pages, string name)
    {
        var complete = Path.Combine(cache, "complete");
        if (File.Exists(complete))
        {
            context.Note($"{name}: reusing the generated index in {cache}");
            return;
        }

        if (Directory.Exists(cache))
        {
            Directory.Delete(cache, recursive: true);
        }

        var directory = Path.Combine(cache, "index");
        Directory.CreateDirectory(directory);
        var corpus = new TermCorpus(seed: pages, 60, 200, 3);
        var queries = new List<string>();
        var (fill, cpu) = Measure.Once(() =>
        {
            using var held = IndexLock.Acquire(directory, "idle benchmark");
            using var catalog = IndexCatalog.Open(held);
            using var store = VectorStore.Open(catalog, directory);
            using var wordStore = PageWordStore.OpenForWriting(directory);
            for (var at = 0; at < pages; at += 500)
            {
                var batch = Enumerable.Range(at, Math.Min(500, pages - at)).Select(i => (Number: i, Key: ServingBenchmark.KeyOf(i), Made: corpus.PageAndWords(i))).ToList();
                ServingBenchmark.AddPages(catalog, wordStore, [.. batch.Select(b => (b.Key, b.Made.Words))]);
                store.AppendAndCommit(corpus.Identity, [.. batch.Select(b => (b.Key, b.Made.Vectors))]);
                queries.AddRange(batch.Where(b => b.Number % 97 == 0).Select(b => string.Join(' ', b.Made.Words.Skip(b.Made.Words.Length / 2).Take(3).Select(w => w.Text))));
            }

            store.SealAll();
        });
        File.WriteAllLines(Path.Combine(cache, "queries.txt"), queries);
        File.WriteAllText(complete, string.Empty);
        context.Note($"{name}: generated {pages} pages in {fill:0} s wall, {cpu:0} s CPU (load {Measure.LoadAverage():0.0})");
    }
}
