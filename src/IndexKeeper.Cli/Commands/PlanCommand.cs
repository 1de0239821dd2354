using System.CommandLine;
using System.Globalization;
using IndexKeeper.Cli.Output;
using IndexKeeper.Service.Application;
using IndexKeeper.Service.Planning;
using IndexKeeper.Service.WorkQueue;

namespace IndexKeeper.Cli.Commands;

/// <summary><c>plan [--calibrate]</c>: read-only — what the next run would do, its cost, and when it would be done.</summary>
internal sealed class PlanCommand() : CommandBase(
    "plan",
    "read-only: what the next run would do, its cost and finish time under the windows; --calibrate times a few pages")
{
    private static readonly CultureInfo C = CultureInfo.InvariantCulture;

    private readonly Option<bool> calibrate = new("--calibrate")
    {
        Description = "time the active encoder on a sample of pages first, for the cost figures",
    };

    public override IEnumerable<Symbol> Symbols => [calibrate];

    public override int Run(CommandContext context, CancellationToken cancellationToken)
    {
        var options = context.LoadOptions();
        var calibrate = context.Value(this.calibrate);
        var report = ThroughDaemon.Ask(options, () =>
        {
            // No daemon: the live workers and their rates come from the work queue itself (read-only).
            var workers = PlanWorkers.Read(options.Queue, out var problem);
            if (problem is not null)
            {
                Console.Error.WriteLine("warning: " + problem);
            }

            using var composed = CommandContext.OpenForReading(options);
            return TerminalProgress.Around(progress => composed.Get<PlanOperation>().Build(
                new PlanRequest(DateTimeOffset.UtcNow, [], calibrate, progress) { Workers = workers }, cancellationToken));
        }, daemon => daemon.Get<PlanReport>("/api/plan" + (calibrate ? "?calibrate=true" : string.Empty)));

        return context.Print(report, Write);
    }

    private static void Write(TextWriter o, PlanReport r)
    {
        o.WriteLine($"Plan for {r.IndexDirectory}, encoder {r.ActiveEncoder} ({r.ActiveEncoderId[..16]}…), from {Time(r.GeneratedAt)} ({r.TimeZone})");
        o.WriteLine($"Changes since the last scan ({(r.LastScanUtc is { } t ? t.ToString("yyyy-MM-dd HH:mm:ss'Z'", C) : "never")}):");
        o.WriteLine(string.Create(C, $"  documents    {r.DocumentsNew} new, {r.DocumentsChanged} changed, {r.DocumentsCopied} copied or moved (free), {r.DocumentsDeleted} deleted, {r.DocumentsQuarantined} to quarantine, {r.DocumentsReread} to read again (newer readers or another LibreOffice)"));
        o.WriteLine(string.Create(C, $"  pages        {r.PagesNew} new, {r.PagesFree} free (keys already held), {r.PagesToRemove} to remove"));
        o.WriteLine(string.Create(C, $"Queued         {r.Queued.Fresh} fresh, {r.Queued.Migration} migration, {r.Queued.Canary} canary"));
        o.WriteLine(string.Create(C, $"Drift          {r.DriftedPages} page(s) only under another encoder ({r.DriftedNotQueued} not yet queued)"));
        if (r.ReadSeconds > 0)
        {
            o.WriteLine(string.Create(C, $"Reading        {r.ReadSeconds:0.0} s for new and changed documents ({string.Join(", ", r.ReadSecondsByKind.Select(k => $"{k.Key} {k.Value:0.0} s"))}); conversion and OCR included"));
        }

        o.WriteLine($"Roots missing  {(r.RootsMissing.Count == 0 ? "none" : string.Join(", ", r.RootsMissing) + " (their documents are kept)")}");
        o.WriteLine(string.Create(C, $"To embed       {r.PagesToEmbed} page(s): {r.Work.Fresh} fresh, {r.Work.Migration} migration, {r.Work.Canary} canary"));
        o.WriteLine(r.EncoderSecondsPerPage is { } spp
            ? string.Create(C, $"Encoder        {spp:0.0000} s/page ({r.ThroughputSource}), {r.EstimatedEncoderSeconds:0.0} s in all")
            : "Encoder        throughput unknown (no history; try --calibrate)");
        if (r.WorkersPagesPerSecond is { } together)
        {
            o.WriteLine(string.Create(C, $"Workers        {r.LiveWorkers} live of the active encoder, {together:0.00} pages/s together (the finish time counts them)"));
        }

        o.WriteLine(r.BytesDelta is { } bytes
            ? string.Create(C, $"Storage        +{bytes / 1048576.0:0.00} MiB ({r.VectorsPerPage:0.0} vectors/page)")
            : "Storage        unknown (no vectors per page measured yet)");
        o.WriteLine(r.CompactionDue
            ? string.Create(C, $"Compaction     due: {r.Compaction.Jobs} job(s) over {r.Compaction.Segments} segment(s), {r.Compaction.BytesToRewrite / 1048576.0:0.00} MiB to rewrite, {r.Compaction.BytesToReclaim / 1048576.0:0.00} MiB to reclaim; {r.Compaction.WordFiles} page-word file(s), {r.Compaction.WordBytesToReclaim / 1048576.0:0.00} MiB to reclaim")
            : "Compaction     not due");
        if (r.Retraining is { } retrain)
        {
            o.WriteLine(retrain.Due
                ? string.Create(C, $"Retraining     due ({retrain.Reason}): the serving view's centroids, {retrain.Pages} pages, about {retrain.EstimatedCpuSeconds:0} CPU s; starts {Time(retrain.StartsAt)}")
                : $"Retraining     not due ({retrain.Reason})");
        }

        var next = r.NextWindowChange is { } change ? $"{(r.WindowOpen ? "closes" : "opens")} {Time(change)}" : "never changes";
        o.WriteLine(string.Create(C, $"Window         {(r.WindowOpen ? "open" : "closed")} now, {next}; budget {r.BudgetPagesPerHour} fresh pages/hour outside windows"));
        o.WriteLine($"Finish         fresh work {Time(r.FreshFinish)}, all work {Time(r.EstimatedFinish)}");
        if (r.Breakdown.Count > 0)
        {
            o.WriteLine("By root and top folder:");
            o.WriteLine($"  {"root",-16} {"folder",-24} {"new",6} {"changed",8} {"copied",7} {"deleted",8} {"embed",8} {"free",8} {"encoder s",10}");
            foreach (var row in r.Breakdown)
            {
                var folder = row.Folder.Length == 0 ? "(top)" : row.Folder;
                o.WriteLine(string.Create(C, $"  {row.Root,-16} {folder,-24} {row.DocumentsNew,6} {row.DocumentsChanged,8} {row.DocumentsCopied,7} {row.DocumentsDeleted,8} {row.PagesToEmbed,8} {row.PagesFree,8} {(row.EstimatedEncoderSeconds is { } s ? s.ToString("0.0", C) : "?"),10}"));
            }
        }

        foreach (var note in r.Notes)
        {
            o.WriteLine("Note: " + note);
        }
    }

    private static string Time(DateTimeOffset? instant) => instant is { } i ? i.ToString("yyyy-MM-dd HH:mm:ss zzz", C) : "unknown";
}
