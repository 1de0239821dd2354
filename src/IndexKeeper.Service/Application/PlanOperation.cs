using System.Diagnostics;
using System.Globalization;
using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Compaction;
using IndexKeeper.Core.Pipeline;
using IndexKeeper.Core.Planning;
using IndexKeeper.Core.Queue;
using IndexKeeper.Core.Scheduling;
using IndexKeeper.Core.Search;
using IndexKeeper.Core.Storage;
using IndexKeeper.Service.Planning;

namespace IndexKeeper.Service.Application;

/// <summary>
/// <c>plan</c> and <c>/api/plan</c> (docs/plan.md): a preview of the scan <c>sync</c> runs, the queue, the
/// drift <c>sync</c> applies, measured throughput, the compaction <c>compact</c> runs and a simulation of
/// the work through the encoder gate. The same pieces as the sync, so the plan cannot drift from it.
/// Reads only: nothing here writes the catalog or the segments.
/// </summary>
public sealed class PlanOperation(OpenIndex index, IndexSettings settings, ScanOperation scan, DriftOperation drift, CompactOperation compact)
{
    /// <summary>Embed runs of the active encoder whose measured throughput the plan uses (the daemon's forecast too).</summary>
    internal const int HistoryRuns = 20;

    /// <summary>Queued and drifted pages attributed to folders one lookup each; past this they are counted unattributed.</summary>
    private const int AttributionLimit = 20_000;

    public PlanReport Build(PlanRequest request, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(request);
        var stopwatch = Stopwatch.StartNew();
        var catalog = index.Catalog;
        var identity = index.Encoder.Identity;
        var calendar = settings.Calendar;
        var zone = calendar.Zone;
        var notes = new List<string>();

        var preview = scan.Preview(request.Progress, cancellationToken);
        var summary = preview.Summary;
        var removed = preview.RemovedKeys;

        // A page key back within the life of its old vectors is made live again, not embedded.
        var activeCounts = catalog.VectorSets.VectorCounts(identity.Id);
        var revived = activeCounts.VectorSets == 0 ? 0 : preview.NewKeys.Count(k => catalog.VectorSets.Find(identity.Id, k) is not null);
        var scanToEmbed = preview.NewKeys.Count - revived;

        var queuedKeys = catalog.Queue.Keys().Where(q => !removed.Contains(q.PageKey)).ToList();
        var queued = new QueuedPages(
            queuedKeys.LongCount(q => q.Priority == QueuePriority.Fresh),
            queuedKeys.LongCount(q => q.Priority == QueuePriority.Migration),
            queuedKeys.LongCount(q => q.Priority == QueuePriority.Canary));
        // The drift policy's own answer (docs/encoders.md), less the pages this scan would remove.
        var decision = drift.Read();
        var drifted = decision.DriftedPages.Where(k => !removed.Contains(k)).ToHashSet(StringComparer.Ordinal);
        if (decision.ServingEncoderId != identity.Id && drifted.Count > 0 && catalog.Encoders.Find(decision.ServingEncoderId) is { } serving)
        {
            // Said before any sync spends it: the configuration names another encoder than the index serves.
            notes.Add(string.Create(CultureInfo.InvariantCulture, $"Encoder change: the index serves {serving.Name} ({serving.Id[..12]}…) and {identity.Name} ({identity.Id[..12]}…) is set, so {drifted.Count} page(s) are embedded again as a migration, inside the windows; searches keep the old vectors until every page has new ones. Without an encoder setting the index keeps its own."));
        }

        var queuedSet = queuedKeys.Select(q => q.PageKey).ToHashSet(StringComparer.Ordinal);
        var driftedNotQueued = drifted.Where(k => !queuedSet.Contains(k)).ToList();
        var work = new QueuedPages(scanToEmbed + queued.Fresh, queued.Migration + driftedNotQueued.Count, queued.Canary);

        var (source, secondsPerPage, vectorsPerPage) = Throughput(preview, request.Calibrate, notes, cancellationToken);
        if (vectorsPerPage is null && activeCounts.VectorSets > 0)
        {
            vectorsPerPage = (double)activeCounts.Vectors / activeCounts.VectorSets;
        }

        var dimensions = identity.Dimensions;
        long? bytesDelta = vectorsPerPage is { } perPage
            ? (long)Math.Round(work.Total * (SegmentFormat.FrameLength + SegmentFormat.VectorSetBodyLength(dimensions, 0) + (perPage * SegmentFormat.BytesPerVector(dimensions))))
            : null;

        var compaction = Compaction(compact.Jobs(), compact.WordFiles());
        var now = TimeZoneInfo.ConvertTime(request.Now, zone);
        // With a work queue the pages are encoded by the live workers of this encoder, side by side: their rates
        // add up. A live worker that has not encoded a page yet is counted at the mean rate of those that have.
        var workers = (request.Workers ?? []).Where(w => w.Live && w.EncoderId == identity.Id).ToList();
        var measured = workers.Where(w => w.PagesPerSecond > 0).ToList();
        double? workersRate = measured.Count > 0 ? measured.Average(w => w.PagesPerSecond) * workers.Count : null;
        if (workersRate is { } rate)
        {
            notes.Add(string.Create(CultureInfo.InvariantCulture, $"{workers.Count} live worker(s) of the active encoder embed {rate:0.00} pages/s together ({measured.Count} measured); the finish time counts them."));
        }

        var simulated = workersRate is { } combined ? 1 / combined : secondsPerPage;
        var forecast = simulated is { } spp
            ? WorkSimulator.Simulate(new EncoderGate(calendar, settings.BudgetPagesPerHour), now.AddSeconds(summary.ReadSeconds), work, spp, request.BudgetSpent, WorkSimulator.DefaultHorizon)
            : null;
        if (forecast is { AllDone: null })
        {
            notes.Add(string.Create(CultureInfo.InvariantCulture, $"Not all work finishes within {WorkSimulator.DefaultHorizon.TotalDays:0} days under these windows and budget (migration and canary work run only inside windows)."));
        }

        if (summary.Problems.Count > 0)
        {
            notes.Add(string.Create(CultureInfo.InvariantCulture, $"{summary.Problems.Count} path(s) could not be looked at; their documents are kept as they are (first: {summary.Problems[0]})."));
        }

        if (summary.DocumentsDeferred > 0)
        {
            notes.Add(string.Create(CultureInfo.InvariantCulture, $"{summary.DocumentsDeferred} document(s) changed while being looked at; a later pass takes them."));
        }

        var change = calendar.NextChange(now);
        return new PlanReport
        {
            IndexDirectory = index.Directory,
            GeneratedAt = now,
            TimeZone = zone.Id,
            ActiveEncoder = identity.Name,
            ActiveEncoderId = identity.Id,
            LastScanUtc = catalog.History.LastScanUtc(),
            DocumentsNew = preview.Changes.LongCount(c => c.Kind == ChangeKind.New),
            DocumentsChanged = preview.Changes.LongCount(c => c.Kind == ChangeKind.Changed),
            DocumentsCopied = preview.Changes.LongCount(c => c.Kind == ChangeKind.Copied),
            DocumentsDeleted = preview.Changes.LongCount(c => c.Kind == ChangeKind.Deleted),
            DocumentsQuarantined = preview.Changes.LongCount(c => c.Kind == ChangeKind.Quarantined),
            DocumentsUnchanged = summary.DocumentsUnchanged,
            DocumentsReread = summary.DocumentsReread,
            PagesToEmbed = work.Total,
            PagesFree = summary.PagesReused + revived,
            PagesToRemove = removed.Count,
            PagesNew = scanToEmbed,
            Queued = queued,
            DriftedPages = drifted.Count,
            DriftedNotQueued = driftedNotQueued.Count,
            Work = work,
            RootsMissing = summary.RootsMissing,
            ReadSecondsByKind = summary.ReadSecondsByKind,
            ReadSeconds = summary.ReadSeconds,
            ThroughputSource = source,
            EncoderSecondsPerPage = secondsPerPage,
            LiveWorkers = workers.Count,
            WorkersPagesPerSecond = workersRate,
            VectorsPerPage = vectorsPerPage,
            EstimatedEncoderSeconds = workersRate is null ? forecast?.EncoderSeconds : work.Total * secondsPerPage,
            BytesDelta = bytesDelta,
            CompactionDue = compaction.Jobs > 0 || compaction.WordFiles > 0,
            Compaction = compaction,
            WindowOpen = calendar.IsOpen(now),
            NextWindowChange = change == DateTimeOffset.MaxValue ? null : TimeZoneInfo.ConvertTime(change, zone),
            BudgetPagesPerHour = settings.BudgetPagesPerHour,
            FreshFinish = InZone(forecast?.FreshDone, zone),
            EstimatedFinish = InZone(forecast?.AllDone, zone),
            Breakdown = Breakdown(catalog, preview, queuedKeys.Select(q => q.PageKey).Concat(driftedNotQueued), secondsPerPage, notes),
            Retraining = Retraining(decision.ServingEncoderId, now, request.RetrainingTriedAt, zone, notes),
            Notes = notes,
            ElapsedSeconds = stopwatch.Elapsed.TotalSeconds,
        };
    }

    /// <summary>
    /// The retraining decision on the serving view (docs/search.md, "Retraining") and its slot in the windows. The daemon
    /// answers from the view it holds; a command from the recall figure in the view file (the share added is not in it).
    /// </summary>
    private PlanRetraining? Retraining(string encoderId, DateTimeOffset now, DateTimeOffset? triedAt, TimeZoneInfo zone, List<string> notes)
    {
        if (settings.Candidates != CandidateSource.Centroids)
        {
            return null;
        }

        var facts = index.Serving.Retraining(encoderId, triedAt)
            ?? new RetrainingFacts(CandidateSource.Centroids, (int)index.Catalog.VectorSets.VectorCounts(encoderId).VectorSets, index.Serving.LastRecall(encoderId), null, null, triedAt);
        var (_, decision, estimate, starts) = RetrainingOutlook.Of(facts, settings, index.Serving, now);
        if (decision.Due && starts is null)
        {
            notes.Add(string.Create(CultureInfo.InvariantCulture, $"The serving view's retraining ({estimate:0} CPU s) fits in no window within {RetrainingSlot.Horizon.TotalDays:0} days; it waits for a longer window."));
        }

        return new PlanRetraining
        {
            Due = decision.Due,
            Trigger = decision.Trigger,
            Reason = decision.Reason,
            Recall = facts.Recall?.Recall,
            AddedShareSinceTraining = facts.AddedShare,
            TrainedAt = InZone(facts.TrainedAt, zone),
            Pages = facts.Pages,
            EstimatedCpuSeconds = estimate,
            StartsAt = InZone(starts, zone),
        };
    }

    private (string Source, double? SecondsPerPage, double? VectorsPerPage) Throughput(
        ScanPreview preview, bool calibrate, List<string> notes, CancellationToken cancellationToken)
    {
        if (calibrate)
        {
            if (EncoderCalibration.Run(index.Catalog, index.Words, index.Encoder, settings.RootPaths, preview.Sample, settings.EmbedBatchSize, cancellationToken) is { } measured)
            {
                notes.Add(string.Create(CultureInfo.InvariantCulture, $"Calibrated on {measured.PagesTimed} page(s) by kind: {measured.ByKind}."));
                return ("calibration", measured.SecondsPerPage, measured.VectorsPerPage);
            }

            notes.Add("Nothing to calibrate on: neither the index nor the pending changes hold a page.");
        }

        if (index.Catalog.History.MeasuredThroughput(index.Encoder.Identity.Id, HistoryRuns) is { } recent)
        {
            return ("history", recent.SecondsPerPage, recent.VectorsPerPage);
        }

        if (!calibrate)
        {
            notes.Add("No measured throughput for the active encoder yet: run 'indexkeeper plan --calibrate' (times a few real pages) or a sync for time estimates.");
        }

        return ("none", null, null);
    }

    private static PlanCompaction Compaction(IReadOnlyList<CompactionJob> jobs, IReadOnlyList<WordFileStats> wordFiles) =>
        new()
        {
            Jobs = jobs.Count,
            Segments = jobs.Sum(j => j.SegmentIds.Count),
            BytesToRewrite = jobs.Sum(j => j.LiveBytes),
            BytesToReclaim = jobs.Sum(j => j.ReclaimedBytes),
            WordFiles = wordFiles.Count,
            WordBytesToReclaim = wordFiles.Sum(f => f.DeadBytes),
        };

    /// <summary>Cost per root and top-level folder: the scan's changes, then queued and drifted pages by where they were seen.</summary>
    private static List<PlanBreakdownRow> Breakdown(IndexCatalog catalog, ScanPreview preview, IEnumerable<string> pendingKeys, double? secondsPerPage, List<string> notes)
    {
        var rows = new Dictionary<(string Root, string Folder), PlanBreakdownRow>();
        PlanBreakdownRow Row(string root, string path)
        {
            var slash = path.IndexOf('/', StringComparison.Ordinal);
            var key = (root, slash < 0 ? string.Empty : path[..slash]);
            if (!rows.TryGetValue(key, out var row))
            {
                row = new PlanBreakdownRow { Root = key.root, Folder = key.Item2 };
                rows[key] = row;
            }

            return row;
        }

        foreach (var change in preview.Changes)
        {
            var row = Row(change.Root, change.Path);
            switch (change.Kind)
            {
                case ChangeKind.New:
                    row.DocumentsNew++;
                    break;
                case ChangeKind.Changed:
                    row.DocumentsChanged++;
                    break;
                case ChangeKind.Copied:
                    row.DocumentsCopied++;
                    break;
                case ChangeKind.Deleted:
                    row.DocumentsDeleted++;
                    break;
            }

            row.PagesToEmbed += change.PagesToEmbed;
            row.PagesFree += change.PagesFree;
        }

        var unattributed = 0L;
        var looked = 0;
        foreach (var key in pendingKeys)
        {
            if (looked++ < AttributionLimit && catalog.Pages.Find(key) is { } page)
            {
                Row(page.SourceRoot, page.SourcePath).PagesToEmbed++;
            }
            else
            {
                unattributed++;
            }
        }

        if (unattributed > 0)
        {
            notes.Add(string.Create(CultureInfo.InvariantCulture, $"{unattributed} queued or drifted page(s) are not attributed to a folder in the breakdown."));
        }

        foreach (var row in rows.Values)
        {
            row.EstimatedEncoderSeconds = row.PagesToEmbed * secondsPerPage;
        }

        return rows.Values.OrderByDescending(r => r.PagesToEmbed).ThenBy(r => r.Root, StringComparer.Ordinal).ThenBy(r => r.Folder, StringComparer.Ordinal).ToList();
    }

    private static DateTimeOffset? InZone(DateTimeOffset? instant, TimeZoneInfo zone) => instant is { } i ? TimeZoneInfo.ConvertTime(i, zone) : null;
}
