using System.Diagnostics;
using System.Diagnostics.Metrics;
using IndexKeeper.Core.Health;
using IndexKeeper.Core.Telemetry;
using Microsoft.AspNetCore.Http;

namespace IndexKeeper.Service.Daemon;

/// <summary>
/// The daemon's observable instruments on the <c>IndexKeeper</c> meter, read from the sampled figures (a
/// scrape never touches the catalog). The engine's own counters and histograms are in <see cref="CoreTelemetry"/>.
/// Exposition names (Prometheus): dots become underscores, the unit is appended (<c>_seconds</c>, <c>_bytes</c>)
/// and counters end in <c>_total</c>.
/// </summary>
internal sealed class DaemonMetrics : IDisposable
{
    /// <summary>
    /// Outcomes of <c>/api/search</c> (label <c>outcome</c>, in this order): answered, refused with a 4xx (bad
    /// parameters or past a cap), cancelled (the client went away before the answer: no fault of the index),
    /// failed.
    /// </summary>
    private static readonly string[] SearchOutcomes = ["answered", "refused", "cancelled", "failed"];
    private const int Answered = 0, Refused = 1, Cancelled = 2, Failed = 3;

    private readonly Meter meter = new(CoreTelemetry.Name);
    private readonly long[] searchRequests = new long[SearchOutcomes.Length];
    private readonly Histogram<double> searchDuration;

    public DaemonMetrics(DaemonState state, HealthLimits limits)
    {
        static KeyValuePair<string, object?> Tag(string key, string value) => new(key, value);

        // Observed from our own tallies so every outcome is a series from the start: a failure share can be computed
        // (and alerted on) before the first failure.
        meter.CreateObservableCounter("indexkeeper.search.requests", () =>
            SearchOutcomes.Select((outcome, i) => new Measurement<long>(Interlocked.Read(ref searchRequests[i]), Tag("outcome", outcome))).ToArray(),
            "{request}", "Requests to /api/search by outcome.");
        searchDuration = meter.CreateHistogram(
            "indexkeeper.search.duration", "s", "Time to answer /api/search, refused and cancelled requests included.", tags: null, new InstrumentAdvice<double> { HistogramBucketBoundaries = CoreTelemetry.SecondsBuckets });

        meter.CreateObservableGauge("indexkeeper.health", () => (int)HealthRules.Evaluate(state.HealthSnapshot(), limits).Status, "1", "The daemon's health as /health judges it: 0 healthy, 1 degraded, 2 unhealthy.");
        meter.CreateObservableGauge("indexkeeper.health.reason", () =>
        {
            var found = HealthRules.Evaluate(state.HealthSnapshot(), limits).Reasons.ToDictionary(r => r.Code, r => (int)r.Severity, StringComparer.Ordinal);
            return HealthRules.Codes.Select(code => new Measurement<int>(found.GetValueOrDefault(code), Tag("code", code))).ToArray();
        }, "1", "Each health reason's severity now: 0 absent, 1 degraded, 2 unhealthy (codes: docs/daemon.md, Health).");
        meter.CreateObservableGauge("indexkeeper.migration.progress", () => state.Figures.Migration.Progress, "1", "Share of pages that have vectors of the active encoder while a migration runs; 1 when none runs.");
        meter.CreateObservableGauge<double>("indexkeeper.migration.time_left", () =>
        {
            var migration = state.Figures.Migration;
            Measurement<double>[] value = !migration.Running ? [new(0)]
                : migration.NotInSight ? [new(double.PositiveInfinity)]
                : migration.ExpectedFinish is { } finish ? [new(Math.Max(0, (finish - state.Clock.GetUtcNow()).TotalSeconds))]
                : [];
            return value;
        }, "s", "Time until the migration's last page is expected to be embedded, through windows and budget at the measured rate: 0 when none runs, +Inf when it does not finish within a year, absent before a rate is measured.");
        meter.CreateObservableGauge("indexkeeper.pages.without_vectors", () => state.Figures.PagesWithoutVectors, "{page}", "Pages no live vector set of the serving encoder covers: searches cannot find them yet.");
        meter.CreateObservableGauge("indexkeeper.files.unsupported", () =>
            state.Figures.UnsupportedTypes.Select(t => new Measurement<long>(t.Files, Tag("type", t.Type))).ToArray(),
            "{file}", "Files of a type no reader takes that the last full walk passed over, by type (lower-case extension; the rarest summed as other).");
        meter.CreateObservableGauge("indexkeeper.root.documents", () => state.Figures.RootTotals.SelectMany(r => new[]
        {
            new Measurement<long>(r.LiveDocuments, Tag("root", r.Root), Tag("state", "live")),
            new Measurement<long>(r.QuarantinedDocuments, Tag("root", r.Root), Tag("state", "quarantined")),
        }).ToArray(), "{document}", "Documents of each root by state (quarantined includes files of a type no reader takes).");
        meter.CreateObservableGauge("indexkeeper.root.pages", () => state.Figures.RootTotals.Select(r => new Measurement<long>(r.PageLocations, Tag("root", r.Root))).ToArray(),
            "{page}", "Pages of each root's live documents, a page counted wherever it appears.");
        meter.CreateObservableGauge("indexkeeper.root.size", () => state.Figures.RootTotals.Select(r => new Measurement<long>(r.Bytes, Tag("root", r.Root))).ToArray(),
            "By", "File bytes of each root's live documents.");
        meter.CreateObservableGauge("indexkeeper.root.present", () => state.Roots.Select(r => new Measurement<int>(r.MissingSinceUtc is null ? 1 : 0, Tag("root", r.Name))).ToArray(),
            "1", "1 while a configured root is there, 0 while it is gone (documents kept for their grace time).");

        meter.CreateObservableGauge("indexkeeper.documents", () =>
        {
            var f = state.Figures;
            return new[]
            {
                new Measurement<long>(f.DocumentsLive, Tag("state", "live")),
                new Measurement<long>(f.DocumentsQuarantined, Tag("state", "quarantined")),
                new Measurement<long>(f.DocumentsUnsupported, Tag("state", "unsupported")),
            };
        }, "{document}", "Documents by state (unsupported: selected by an include glob, of a type no reader takes; not a fault).");
        meter.CreateObservableGauge("indexkeeper.files.passed_over", () =>
        {
            var f = state.Figures;
            return new[] { new Measurement<long>(f.FilesSkippedByPattern, Tag("reason", "pattern")), new Measurement<long>(f.FilesUnsupported, Tag("reason", "unsupported_type")) };
        }, "{file}", "Files the last full walk passed over: left out by the root's globs, or of a type no reader takes.");
        meter.CreateObservableGauge("indexkeeper.pages", () =>
        {
            var f = state.Figures;
            return new[]
            {
                new Measurement<long>(f.Pages, Tag("state", "live")),
                new Measurement<long>(f.PagesWithVectors, Tag("state", "embedded")),
                new Measurement<long>(f.Queued, Tag("state", "queued")),
                new Measurement<long>(f.PagesQuarantined, Tag("state", "quarantined")),
            };
        }, "{page}", "Distinct page keys by state.");
        meter.CreateObservableGauge("indexkeeper.queue.depth", () =>
        {
            var f = state.Figures;
            return new[]
            {
                new Measurement<long>(f.QueuedFresh, Tag("priority", "fresh")),
                new Measurement<long>(f.QueuedMigration, Tag("priority", "migration")),
                new Measurement<long>(f.QueuedCanary, Tag("priority", "canary")),
            };
        }, "{page}", "Queued pages by priority.");
        meter.CreateObservableGauge("indexkeeper.embed.rate", () => state.PagesPerSecond, "{page}/s", "Pages embedded per second over the last sample interval.");
        meter.CreateObservableGauge("indexkeeper.full_walk.age", () => state.LastFullWalk is { } at ? (state.Clock.GetUtcNow() - at).TotalSeconds : double.NaN, "s", "Time since the last completed full walk of every root.");
        meter.CreateObservableCounter("indexkeeper.watcher.overflows", () => state.WatcherOverflows, "{overflow}", "Change notification overflows that fell back to a full walk.");
        meter.CreateObservableGauge("indexkeeper.quarantine", () =>
        {
            var f = state.Figures;
            return new[] { new Measurement<long>(f.DocumentsQuarantined, Tag("kind", "document")), new Measurement<long>(f.PagesQuarantined, Tag("kind", "page")) };
        }, "{item}", "Quarantined documents (unreadable) and pages (encoder kept failing).");
        meter.CreateObservableGauge("indexkeeper.segments", () =>
        {
            var f = state.Figures;
            return new[] { new Measurement<long>(f.SegmentsOpen, Tag("state", "open")), new Measurement<long>(f.SegmentsSealed, Tag("state", "sealed")) };
        }, "{segment}", "Segment files by state.");
        meter.CreateObservableGauge("indexkeeper.dead.ratio", () => state.Figures.DeadRatio, "1", "Share of segment bytes no live vector set uses.");
        meter.CreateObservableGauge("indexkeeper.disk.usage", () => state.Figures.BytesOnDisk, "By", "Bytes of the index directory on disk.");
        meter.CreateObservableGauge("indexkeeper.pages.drifted", () => state.Figures.QueuedMigration, "{page}", "Pages waiting to be embedded again under the active encoder.");
        meter.CreateObservableGauge("indexkeeper.canary.cosine", () => state.Canaries is { } c
            ? new[] { new Measurement<double>(c.MeanCosine, Tag("statistic", "mean")), new Measurement<double>(c.MinimumCosine, Tag("statistic", "minimum")) }
            : [], "1", "Cosine of re-embedded canary vectors against the stored ones at the last check (1: no drift).");
        meter.CreateObservableGauge("indexkeeper.search.candidate_recall", () => state.CandidateRecall is { } r
            ? new[] { new Measurement<double>(r.Recall) }
            : [], "1", "Share of the exhaustive top-10 the served search returned on the last sample queries (docs/search.md, \"Recall\").");
        meter.CreateObservableGauge("indexkeeper.search.centroids.added_share", () => state.Retraining?.Facts.AddedShare is { } share
            ? new[] { new Measurement<double>(share) }
            : [], "1", "Share of the serving view's vectors added since its centroids were trained (docs/search.md, \"Retraining\").");
        meter.CreateObservableGauge("indexkeeper.search.centroids.trained_timestamp", () => state.Retraining?.Facts.TrainedAt is { } at
            ? new[] { new Measurement<double>(at.ToUnixTimeMilliseconds() / 1000.0) }
            : [], "s", "When the serving view's centroids were last trained, in seconds since the Unix epoch.");
        meter.CreateObservableGauge("indexkeeper.search.centroids.retrain_due", () => state.Retraining is { } r
            ? new[] { new Measurement<int>(r.Decision.Due ? 1 : 0) }
            : [], "1", "1 while a retraining of the serving view's centroids waits for a window (or runs), 0 otherwise.");
        meter.CreateObservableGauge("indexkeeper.window.open", () => state.Allowance.WindowOpen ? 1 : 0, "1", "1 while a work window is open, 0 outside windows (the budget applies).");
        meter.CreateObservableGauge("indexkeeper.work_queue.reachable", () => state.WorkQueue is { } q ? new[] { new Measurement<int>(q.Fault is null ? 1 : 0) } : [], "1", "1 while the work queue's PostgreSQL answers, 0 while it does not (only with Queue:Connection).");
        meter.CreateObservableGauge("indexkeeper.work_queue.jobs", () => state.WorkQueue is { Fault: null } q
            ? new[]
            {
                new Measurement<long>(q.Waiting, Tag("state", "waiting")),
                new Measurement<long>(q.Claimed, Tag("state", "claimed")),
                new Measurement<long>(q.Finished, Tag("state", "finished")),
                new Measurement<long>(q.Expired, Tag("state", "lease_expired")),
            }
            : [], "{job}", "Jobs in the work queue by state; lease_expired: claimed by a worker that went silent, claimable again.");
        meter.CreateObservableCounter("indexkeeper.work_queue.results", () => state.WorkQueue is { } q
            ? new[] { new Measurement<long>(q.Committed, Tag("outcome", "committed")), new Measurement<long>(q.Rejected, Tag("outcome", "rejected")) }
            : [], "{result}", "Vector sets handed back by workers since start: committed, or rejected (another encoder id, bad bytes).");
        meter.CreateObservableCounter("indexkeeper.work_queue.commits", () => state.WorkQueue is { } q ? new[] { new Measurement<long>(q.Commits) } : [], "{commit}", "Commits (one fsync and one catalog transaction each) that held the committed results; results over commits is the batch a commit carries.");
        meter.CreateObservableGauge("indexkeeper.work_queue.workers", () => state.WorkQueue is { } q ? new[] { new Measurement<int>(q.LiveWorkers) } : [], "{worker}", "Workers with a recent heartbeat.");
        meter.CreateObservableGauge("indexkeeper.work_queue.worker.rate", () => (state.WorkQueue?.Workers ?? []).Where(w => w.Live)
            .Select(w => new Measurement<double>(w.PagesPerSecond, Tag("worker", w.Worker), Tag("encoder", w.EncoderName), Tag("encoder_id", w.EncoderId[..Math.Min(12, w.EncoderId.Length)]))), "{page}/s", "Each live worker's pages per second of encoder time.");
        meter.CreateObservableGauge("indexkeeper.work_queue.worker.leases_taken_over", () => (state.WorkQueue?.Workers ?? []).Where(w => w.Live)
            .Select(w => new Measurement<long>(w.LeasesTakenOver, Tag("worker", w.Worker))), "{lease}", "Jobs each live worker took over after another's lease expired.");
        meter.CreateObservableGauge("indexkeeper.roots.missing", () => state.Roots.Count(r => r.MissingSinceUtc is not null), "{root}", "Roots that are gone (documents kept for their grace time).");
    }

    /// <summary>
    /// Answers a search request through <paramref name="answer"/>, counting its outcome and its time; a search
    /// stopped because <paramref name="requestAborted"/> fired (the client went away) counts as cancelled.
    /// </summary>
    public IResult TimeSearch(Func<IResult> answer, CancellationToken requestAborted)
    {
        var started = Stopwatch.GetTimestamp();
        var outcome = Failed;
        try
        {
            var result = answer();
            outcome = result is IStatusCodeHttpResult { StatusCode: >= 400 and < 500 } ? Refused : Answered;
            return result;
        }
        catch (OperationCanceledException) when (requestAborted.IsCancellationRequested)
        {
            outcome = Cancelled;
            throw;
        }
        finally
        {
            Interlocked.Increment(ref searchRequests[outcome]);
            searchDuration.Record(Stopwatch.GetElapsedTime(started).TotalSeconds);
        }
    }

    public void Dispose() => meter.Dispose();
}
