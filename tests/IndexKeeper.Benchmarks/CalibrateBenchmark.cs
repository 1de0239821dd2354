using System.Text.Json;

namespace IndexKeeper.Benchmarks;

/// <summary>
/// <c>plan --calibrate</c> against the run it predicts, on a fresh index of the demo store (PDF manuals,
/// forms, reports and drawings; PNG, JPEG and TIFF scans) with the default encoder, both through the real
/// executable: the plan's encoder seconds per page against the sync's measured encoder seconds per page,
/// and the plan's whole run (its reading time plus encoder seconds) against the sync's wall time.
/// </summary>
public sealed class CalibrateBenchmark : IBenchmark
{
    public string Name => "calibrate";

    public void Run(BenchmarkContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        var store = Path.Combine(context.WorkDirectory, "store");
        var roots = context.Quick ? EmbedBenchmark.SmokeStore(store) : EmbedBenchmark.DemoRoots(context, store);
        string[] settings =
        [
            "--index", Path.Combine(context.WorkDirectory, "index"), "--encoder", "minilm", "--Detect:SettleSeconds=0",
            .. roots.SelectMany(r => new[] { "--root", $"{r.Name}={r.Path}" }),
        ];

        JsonElement plan = default, sync = default;
        var (planWall, _) = Measure.Once(() => plan = CliJson.Run(context.WorkDirectory, ["plan", "--calibrate", "--json", .. settings]));
        var (syncWall, _) = Measure.Once(() => sync = CliJson.Run(context.WorkDirectory, partialFailureAllowed: true, ["sync", "--json", .. settings]));

        var pagesPlanned = plan.GetProperty("pagesToEmbed").GetInt64();
        var planned = plan.GetProperty("encoderSecondsPerPage").GetDouble();
        var readPlanned = plan.GetProperty("readSeconds").GetDouble();
        var pagesEmbedded = sync.GetProperty("pagesEmbedded").GetInt64();
        var measured = sync.GetProperty("encoderSeconds").GetDouble() / pagesEmbedded;
        var runPlanned = readPlanned + (pagesPlanned * planned);
        var runMeasured = sync.GetProperty("elapsedSeconds").GetDouble();

        context.Report("pages to embed (plan) / embedded (sync)", pagesPlanned, "pages");
        context.Report("pages embedded (sync)", pagesEmbedded, "pages");
        context.Report("encoder seconds per page, plan --calibrate", planned, "s");
        context.Report("encoder seconds per page, sync (encoder seconds / pages embedded)", measured, "s");
        context.Report("ratio measured / planned, encoder", measured / planned, "x");
        context.Report("run, planned (reading + pages x seconds per page)", runPlanned, "s");
        context.Report("run, measured (sync elapsedSeconds)", runMeasured, "s");
        context.Report("ratio measured / planned, run", runMeasured / runPlanned, "x");
        context.Report("plan --calibrate, wall (process)", planWall, "s");
        context.Report("sync, wall (process)", syncWall, "s");
        context.Report("reading, planned (plan readSeconds)", readPlanned, "s");
        context.Report("documents quarantined (sync; a read past its timeout on a loaded machine quarantines)", sync.GetProperty("documentsQuarantined").GetInt64(), "files");
        foreach (var note in plan.GetProperty("notes").EnumerateArray())
        {
            context.Note("plan: " + note.GetString());
        }
    }
}
