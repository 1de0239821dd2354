using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Index;
using IndexKeeper.Service.Hosting;

namespace IndexKeeper.Service.Application;

/// <summary>
/// <c>status</c> and <c>/api/status</c>: the figures of the index. Reads only. The counts come from the catalog's
/// running counts (<see cref="RunningCounts"/>): in the daemon they move with each commit, so a request costs what
/// changed since the last one; a process that opens the index for one <c>status</c> counts everything once.
/// </summary>
public sealed class StatusOperation(OpenIndex index, IndexSettings settings, DriftOperation drift)
{
    // Segments found clean by an earlier request, unchanged since (record and file): not inspected again. Without it
    // each request read every vector-set record of every segment (about half a second at 100,000 pages). One request
    // at a time uses it (it is a plain dictionary); the rest of a request does not wait for it.
    private readonly CleanSegments clean = new();

    public StatusReport Read()
    {
        var catalog = index.Catalog;
        var activeId = index.Encoder.Identity.Id;
        // A catalog that never recorded its serving encoder has it inferred from every live page key (rare: new or old catalogs).
        var recorded = catalog.Encoders.ServingId();
        var decision = recorded is null ? drift.Read() : null;
        var (figures, liveSets, allSets, byKind, quarantined, servingId, coverage, drifted, migrated) = catalog.Counts.Read(counts =>
        {
            var (drifted, migrated) = decision is null ? counts.Migration(recorded!, activeId) : (decision.DriftedPages.Count, decision.MigratedPages);
            // As DriftPolicy decides: once no page is left to migrate, the active encoder serves (the switch-over).
            var serving = decision?.ServingEncoderId ?? (drifted == 0 ? activeId : recorded!);
            return (counts.Figures(), counts.LiveVectorSets, counts.VectorSetRecords, counts.LiveByKind(), counts.QuarantinedDocumentIds(), serving, counts.Coverage(serving, activeId), drifted, migrated);
        });
        var segments = catalog.Segments.All();
        var segmentBytes = segments.Sum(s => s.Length);
        DamageReport damage;
        lock (clean)
        {
            damage = DamageSurvey.RunRunning(catalog, index.Store.Directory, servingId, coverage, clean, CancellationToken.None);
        }

        var canary = CanaryReport.Of(catalog.Encoders.Find(activeId));
        var training = index.Serving.LastTraining(servingId);
        return new StatusReport
        {
            IndexDirectory = index.Directory,
            Documents = figures.Documents,
            Pages = figures.Pages,
            PageLocations = figures.PageLocations,
            VectorSets = allSets,
            LiveVectorSets = liveSets,
            Segments = segments.Count,
            DeadRatio = segmentBytes == 0 ? 0 : 1.0 - ((double)segments.Sum(s => s.LiveBytes) / segmentBytes),
            ActiveEncoder = settings.Encoder.Name,
            ActiveEncoderId = index.Encoder.Identity.Id,
            ServingEncoderId = servingId,
            PagesDrifted = drifted,
            PagesMigrated = migrated,
            CanaryDrifted = canary?.Drifted ?? false,
            Canary = canary,
            CandidateRecall = index.Serving.LastRecall(servingId),
            CentroidsTrainedAt = training.TrainedAt,
            AddedShareSinceTraining = training.AddedShare,
            SegmentsMissing = damage.SegmentsMissing,
            VectorSetsUnreadable = damage.VectorSetsUnreadable,
            PagesWithoutVectors = damage.PagesWithoutVectors,
            Queued = figures.Queued,
            Quarantined = figures.QuarantinedDocuments,
            BytesOnDisk = DirectorySize.Of(index.Directory),
            LastScanUtc = figures.LastScanUtc,
            Roots = settings.RootNames.Count > 0 ? settings.RootNames : catalog.Documents.RootNames().ToList(),
            Quarantine = quarantined.Select(catalog.Documents.FindById).OfType<DocumentRecord>()
                .OrderBy(d => d.Root, StringComparer.Ordinal).ThenBy(d => d.Path, StringComparer.Ordinal)
                .Select(d => new QuarantineEntry(d.Root, d.Path, d.QuarantineReason?.ToString() ?? "Unknown", d.QuarantineMessage ?? string.Empty, d.LastChangedUtc.ToUniversalTime()))
                .ToList(),
            Files = FileTally.Of(catalog, figures, byKind),
        };
    }
}
