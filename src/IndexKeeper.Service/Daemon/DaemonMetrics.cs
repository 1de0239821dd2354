using System.Diagnostics.Metrics;
using IndexKeeper.Core.Telemetry;

namespace IndexKeeper.Service.Daemon;

/// <summary>
/// The daemon's observable instruments on the <c>IndexKeeper</c> meter, read from the sampled figures (a
/// scrape never touches the catalog). The engine's own counters and histograms are in <see cref="CoreTelemetry"/>.
/// Exposition names (Prometheus): dots become underscores, the unit is appended (<c>_seconds</c>, <c>_bytes</c>)
/// and counters end in <c>_total</c>.
/// </summary>
internal sealed class DaemonMetrics : IDisposable
{
    private readonly Meter meter = new(CoreTelemetry.Name);

    public DaemonMetrics(DaemonState state)
    {
        static KeyValuePair<string, object?> Tag(string key, string value) => new(key, value);

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
        meter.CreateObservableGauge("indexkeeper.work_queue.workers", () => state.WorkQueue is { } q ? new[] { new Measurement<int>(q.LiveWorkers) } : [], "{worker}", "Workers with a recent heartbeat.");
        meter.CreateObservableGauge("indexkeeper.work_queue.worker.rate", () => (state.WorkQueue?.Workers ?? []).Where(w => w.Live)
            .Select(w => new Measurement<double>(w.PagesPerSecond, Tag("worker", w.Worker), Tag("encoder", w.EncoderName), Tag("encoder_id", w.EncoderId[..Math.Min(12, w.EncoderId.Length)]))), "{page}/s", "Each live worker's pages per second of encoder time.");
        meter.CreateObservableGauge("indexkeeper.work_queue.worker.leases_taken_over", () => (state.WorkQueue?.Workers ?? []).Where(w => w.Live)
            .Select(w => new Measurement<long>(w.LeasesTakenOver, Tag("worker", w.Worker))), "{lease}", "Jobs each live worker took over after another's lease expired.");
        meter.CreateObservableGauge("indexkeeper.roots.missing", () => state.Roots.Count(r => r.MissingSinceUtc is not null), "{root}", "Roots that are gone (documents kept for their grace time).");
    }

    public void Dispose() => meter.Dispose();
}
