using System.Globalization;
using IndexKeeper.Service.Application;
using IndexKeeper.Service.Hosting;

namespace IndexKeeper.Cli.Commands;

/// <summary><c>status</c>: figures of the index and its quarantine list.</summary>
internal sealed class StatusCommand() : CommandBase(
    "status",
    "figures of the index: documents, pages, vector sets, segments, queue, quarantine")
{
    public override int Run(CommandContext context, CancellationToken cancellationToken)
    {
        var options = context.LoadForExistingIndex();
        var report = ThroughDaemon.Ask(options, () =>
        {
            using var composed = CommandContext.OpenForReading(options);
            return composed.Get<StatusOperation>().Read();
        }, daemon => daemon.Get<StatusReport>("/api/status"));
        return context.Print(report, Write);
    }

    private static string UnsupportedTypes(FileTally files) =>
        files.UnsupportedTypes.Count == 0 ? string.Empty : " (" + string.Join(", ", files.UnsupportedTypes.Take(8).Select(t => string.Create(CultureInfo.InvariantCulture, $"{t.Type} {t.Files}"))) + (files.UnsupportedTypes.Count > 8 ? ", …)" : ")");

    private static void Write(TextWriter o, StatusReport report)
    {
        var c = CultureInfo.InvariantCulture;
        o.WriteLine($"Index {report.IndexDirectory}");
        o.WriteLine(string.Create(c, $"  documents    {report.Documents} live, {report.Quarantined} quarantined"));
        var files = report.Files;
        o.WriteLine("  by kind      " + (files.IndexedByKind.Count == 0 ? "none" : string.Join(", ", files.IndexedByKind.Select(k => string.Create(c, $"{k.Key} {k.Value}")))));
        o.WriteLine(string.Create(c, $"  passed over  {files.SkippedByPattern} left out by the root's globs, {files.Unsupported + files.SelectedButUnsupported} of a type no reader takes{UnsupportedTypes(files)}"));
        o.WriteLine(string.Create(c, $"  pages        {report.Pages} distinct page keys in {report.PageLocations} page locations"));
        o.WriteLine(string.Create(c, $"  vector sets  {report.LiveVectorSets} live of {report.VectorSets}, in {report.Segments} segment(s), dead share {report.DeadRatio:P1}"));
        o.WriteLine($"  encoder      {report.ActiveEncoder} ({report.ActiveEncoderId[..16]}…)");
        if (report.ServingEncoderId != report.ActiveEncoderId)
        {
            o.WriteLine(string.Create(c, $"  migration    serving {report.ServingEncoderId[..16]}…: {report.PagesMigrated} page(s) migrated, {report.PagesDrifted} drifted and queued"));
        }

        if (report.Canary is { } canary)
        {
            o.WriteLine(string.Create(c, $"  canaries     {(canary.Drifted ? "DRIFTED" : "ok")}: {canary.Pages} page(s), mean cosine {canary.MeanCosine:0.000000}, minimum {canary.MinimumCosine:0.000000}, {canary.CheckedUtc:yyyy-MM-dd HH:mm:ss'Z'}"));
        }

        if (report.CandidateRecall is { } recall)
        {
            o.WriteLine(string.Create(c, $"  recall       {recall.Recall:0.000} of the exhaustive top-10 on {recall.Queries} sample queries, {recall.MeasuredAt:yyyy-MM-dd HH:mm:ss'Z'}"));
        }

        if (report.CentroidsTrainedAt is { } trained)
        {
            o.WriteLine(string.Create(c, $"  centroids    trained {trained:yyyy-MM-dd HH:mm:ss'Z'}, {report.AddedShareSinceTraining ?? 0:P1} of the vectors added since"));
        }

        o.WriteLine(string.Create(c, $"  queued       {report.Queued} pages waiting for vectors"));
        o.WriteLine(string.Create(c, $"  no vectors   {report.PagesWithoutVectors} page(s) without readable vectors (queued ones included)"));
        if (report.SegmentsMissing > 0 || report.VectorSetsUnreadable > 0)
        {
            o.WriteLine(string.Create(c, $"  DAMAGE       {report.SegmentsMissing} segment file(s) missing, {report.VectorSetsUnreadable} vector set(s) unreadable; run `indexkeeper verify` (docs/recovery.md)"));
        }
        o.WriteLine(string.Create(c, $"  on disk      {report.BytesOnDisk / 1024.0 / 1024.0:0.0} MiB"));
        o.WriteLine(string.Create(c, $"  last scan    {(report.LastScanUtc is { } t ? t.ToString("yyyy-MM-dd HH:mm:ss'Z'", c) : "never")}"));
        if (report.WorkQueue is { } queue)
        {
            o.WriteLine(queue.Fault is { } fault
                ? $"  work queue   PostgreSQL does not answer since {queue.FaultSinceUtc:yyyy-MM-dd HH:mm:ss'Z'}: {fault}"
                : string.Create(c, $"  work queue   {queue.Waiting} waiting, {queue.Claimed} claimed ({queue.Expired} lease(s) expired), {queue.Finished} handed back; {queue.Committed} committed, {queue.Rejected} rejected since start"));
            foreach (var worker in queue.Workers)
            {
                o.WriteLine(string.Create(c, $"  worker       {worker.Worker} on {worker.Host}: {(worker.Live ? "live" : "silent")}, {worker.EncoderName} ({worker.EncoderId[..Math.Min(12, worker.EncoderId.Length)]}…), {worker.PagesDone} pages at {worker.PagesPerSecond:0.00}/s, {worker.PagesFailed} failed, {worker.LeasesTakenOver} lease(s) taken over"));
            }
        }

        if (report.Quarantine.Count > 0)
        {
            o.WriteLine("Quarantine (retried when the file changes):");
            foreach (var q in report.Quarantine)
            {
                o.WriteLine($"  {q.Root}/{q.Path}  {q.Reason}: {q.Message}");
            }
        }
    }
}
