using System.Diagnostics;
using System.Text.Json;

namespace IndexKeeper.Benchmarks;

/// <summary>
/// The daemon (<c>indexkeeper run</c>, the real process): change-to-searchable latency of one new document
/// while idle (p50/p95; the settle time is part of it and reported beside it), and the daemon's overhead —
/// CPU share and resident memory — while idle on a large tree and during a no-change full walk of it.
/// The tree holds copies of a few hundred distinct reports: copies cost a hash, not a parse, which keeps
/// the setup affordable; a no-change walk costs the same stat per file either way.
/// </summary>
public sealed class DaemonBenchmark : IBenchmark
{
    public string Name => "daemon";

    public void Run(BenchmarkContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        var files = context.Quick ? 1_000 : 20_000;
        var samples = context.Quick ? 5 : 20;
        var idleSeconds = context.Quick ? 5 : 30;
        const double settleSeconds = 2;
        var root = Path.Combine(context.WorkDirectory, "store");
        var distinct = Enumerable.Range(0, 200).Select(i => GeneratedReport.Build(i, [0, 0], 120)).ToList();
        for (var i = 0; i < files; i++)
        {
            var folder = Path.Combine(root, $"site-{i / 1000:D2}", $"year-{(i / 100) % 10:D2}");
            Directory.CreateDirectory(folder);
            File.WriteAllBytes(Path.Combine(folder, $"report-{i:D5}.pdf"), distinct[i % distinct.Count]);
        }

        context.Report("documents in the tree", files, "files");
        string[] args = ["--root", "store", "--encoder", "hashed-terms", "--Schedule:Windows:0=Mon-Sun 00:00-24:00", $"--Detect:SettleSeconds={settleSeconds}"];

        // First run: index the tree (not measured), then stop.
        using (var first = DaemonProcess.Start(context.WorkDirectory, args))
        {
            first.WaitUntil(TimeSpan.FromMinutes(30), () =>
            {
                var status = first.Get("/api/status");
                return status.GetProperty("documents").GetInt64() == files && status.GetProperty("queued").GetInt64() == 0;
            });
            first.Stop();
        }

        // Second run: its start-up walk finds nothing changed; measure it, then idle, then single new documents.
        using var daemon = DaemonProcess.Start(context.WorkDirectory, args);
        var walk = daemon.Sample(() => daemon.Get("/api/daemon").TryGetProperty("lastFullWalk", out var at) && at.ValueKind == JsonValueKind.String, TimeSpan.FromMinutes(30));
        context.Report("no-change full walk: wall", walk.Seconds, "s");
        context.Report("no-change full walk: CPU share of one core", walk.CpuShare * 100, "%");
        context.Report("no-change full walk: peak resident memory", walk.PeakRssMegabytes, "MiB");
        var idle = daemon.Sample(() => false, TimeSpan.FromSeconds(idleSeconds));
        context.Report("idle: CPU share of one core", idle.CpuShare * 100, "%");
        context.Report("idle: resident memory", idle.PeakRssMegabytes, "MiB");
        context.Report("ratio walk / idle CPU share", walk.CpuShare / Math.Max(idle.CpuShare, 1e-6), "x");

        var latencies = new List<double>();
        var incoming = Directory.CreateDirectory(Path.Combine(context.WorkDirectory, "incoming")).FullName;
        for (var i = 0; i < samples; i++)
        {
            // Written beside the root, then renamed in: the document appears whole, as a finished copy does.
            var name = $"fresh-{i:D3}.pdf";
            File.WriteAllBytes(Path.Combine(incoming, name), GeneratedReport.Build(100_000 + i, [1], 80));
            var query = $"Works report {100_000 + i}";
            var clock = Stopwatch.StartNew();
            File.Move(Path.Combine(incoming, name), Path.Combine(root, name));
            daemon.WaitUntil(TimeSpan.FromMinutes(2), () => daemon.Get("/api/search?q=" + Uri.EscapeDataString(query) + "&k=3")
                .GetProperty("hits").EnumerateArray().Any(h => h.GetProperty("path").GetString() == name), pollMilliseconds: 20);
            latencies.Add(clock.Elapsed.TotalSeconds);
            Thread.Sleep(500);
        }

        latencies.Sort();
        var p50 = Percentile(latencies, 0.5);
        var p95 = Percentile(latencies, 0.95);
        context.Report("change-to-searchable, one new document, p50", p50, "s");
        context.Report("change-to-searchable, one new document, p95", p95, "s");
        context.Report("settle time (Detect:SettleSeconds, the baseline)", settleSeconds, "s");
        context.Report("p50 beyond the settle time", p50 - settleSeconds, "s");
        daemon.Stop();
        context.Note($"{samples} new documents one at a time, 0.5 s apart, polled every 20 ms through /api/search; hashed-terms encoder; memory is the daemon's own (the reader worker process apart)");
    }

    private static double Percentile(List<double> sorted, double p) => sorted[Math.Min(sorted.Count - 1, (int)Math.Ceiling(p * sorted.Count) - 1)];
}
