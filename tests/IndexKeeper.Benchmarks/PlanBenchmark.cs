using IndexKeeper.Core.Pipeline;
using IndexKeeper.Core.Planning;
using IndexKeeper.Core.Queue;
using IndexKeeper.Core.Scheduling;
using IndexKeeper.Service.Configuration;
using IndexKeeper.Service.Application;
using IndexKeeper.Service.Planning;

namespace IndexKeeper.Benchmarks;

/// <summary>
/// The plan on a synced tree with 5 % new documents: the whole read-only plan (dry-run scan, queue,
/// drift, compaction, simulation) against the real scan pass over the same changes in the same run, each
/// the first run of a fresh session;
/// and the finish-time simulation alone on a large backlog under the default windows.
/// </summary>
public sealed class PlanBenchmark : IBenchmark
{
    private const int Repeats = 3;

    public string Name => "plan";

    public void Run(BenchmarkContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        var documents = context.Quick ? 100 : 2_000;
        var added = documents / 20;
        var root = Path.Combine(context.WorkDirectory, "store");
        Generate(root, 0, documents);
        var options = OptionsLoader.Load(new ConfigurationSources(null, Path.Combine(context.WorkDirectory, "index"), [root],
            ["Detect:SettleSeconds=0", "Encoder:Name=hashed-terms", "Schedule:TimeZone=Europe/Berlin"]));
        using (var composed = IndexComposition.Open(options, "benchmark plan: first sync"))
        {
            composed.Get<SyncOperation>().Run("benchmark", null, CancellationToken.None);
        }

        Generate(root, documents, added);
        context.Report("documents synced", documents, "files");
        context.Report("documents added since", added, "files");

        // First runs in a fresh session on both sides (reader worker started, catalog cold), then warm plans.
        PlanReport report = null!;
        (double Wall, double Cpu) planFirst, plan;
        using (var composed = IndexComposition.OpenReadOnly(options))
        {
            var planning = composed.Get<PlanOperation>();
            planFirst = Measure.Once(() => report = planning.Build(new PlanRequest(DateTimeOffset.UtcNow, [], Calibrate: false), CancellationToken.None));
            plan = Measure.Median(Repeats, () => report = planning.Build(new PlanRequest(DateTimeOffset.UtcNow, [], Calibrate: false), CancellationToken.None));
        }

        if (report.DocumentsNew != added || report.PagesToEmbed == 0 || report.EstimatedFinish is null)
        {
            throw new InvalidOperationException($"plan saw {report.DocumentsNew} new documents of {added}, {report.PagesToEmbed} pages to embed, finish {report.EstimatedFinish}");
        }

        ScanSummary real = null!;
        (double Wall, double Cpu) scan;
        using (var composed = IndexComposition.Open(options, "benchmark plan: real scan"))
        {
            var scanning = composed.Get<ScanOperation>();
            scan = Measure.Once(() => real = scanning.Walk("benchmark", composed.Settings.Scan.Roots, CancellationToken.None));
        }

        if (real.PagesNew != report.PagesNew)
        {
            throw new InvalidOperationException($"the plan said {report.PagesNew} new pages, the scan found {real.PagesNew}");
        }

        context.Report("pages to embed (plan)", report.PagesToEmbed, "pages");
        context.Report("plan, first run in a fresh session", planFirst.Wall, "s");
        context.Report("plan, first run, cpu", planFirst.Cpu, "s");
        context.Report("real scan pass over the same changes, first run in a fresh session (baseline)", scan.Wall, "s");
        context.Report("real scan pass, cpu", scan.Cpu, "s");
        context.Report("ratio plan / real scan, first runs", planFirst.Wall / scan.Wall, "x");
        context.Report("ratio plan / real scan, first runs, cpu", planFirst.Cpu / scan.Cpu, "x");
        context.Report("plan, warm (session open, repeated)", plan.Wall, "s");
        context.Report("plan, warm, cpu", plan.Cpu, "s");

        // A large backlog under the default windows (weeknights and weekends) in Berlin, with the budget
        // serving fresh work by day: every gate decision of weeks of work is simulated.
        var calendar = WindowCalendar.Parse(ScheduleOptions.DefaultWindows, TimeZoneInfo.FindSystemTimeZoneById("Europe/Berlin"));
        var gate = new EncoderGate(calendar, 600);
        var work = new QueuedPages(50_000, 1_000_000, 500);
        var start = new DateTimeOffset(2026, 10, 19, 9, 0, 0, TimeSpan.FromHours(2));
        WorkForecast forecast = null!;
        var simulation = Measure.Median(Repeats, () => forecast = WorkSimulator.Simulate(gate, start, work, 0.5, [], WorkSimulator.DefaultHorizon));
        var days = (forecast.AllDone!.Value - start).TotalDays;
        context.Report("simulated backlog: fresh + migration + canary pages", work.Total, "pages");
        context.Report("simulated span until all work is done", days, "days");
        context.Report("finish-time simulation", simulation.Wall * 1000, "ms");
        context.Report("finish-time simulation per simulated day", simulation.Wall * 1000 / days, "ms");
        context.Note($"medians of {Repeats} runs after a warm-up (the real scan: one run, it changes the catalog); encoder hashed-terms; 0.5 s per page in the simulation");
    }

    private static void Generate(string root, int first, int count)
    {
        var hourAgo = DateTime.UtcNow.AddHours(-1);
        Parallel.For(first, first + count, new ParallelOptions { MaxDegreeOfParallelism = Environment.ProcessorCount }, d =>
        {
            var folder = Path.Combine(root, $"site-{d / 500:D2}", $"year-{d / 50 % 10:D2}");
            Directory.CreateDirectory(folder);
            var path = Path.Combine(folder, $"report-{d:D5}.pdf");
            File.WriteAllBytes(path, GeneratedReport.Build(d, new int[1 + (d * 7 % 5)], wordsPerPage: 60));
            File.SetLastWriteTimeUtc(path, hourAgo);
        });
    }
}
