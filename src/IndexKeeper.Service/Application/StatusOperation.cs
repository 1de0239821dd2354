using IndexKeeper.Core.Index;
using IndexKeeper.Service.Hosting;

namespace IndexKeeper.Service.Application;

/// <summary><c>status</c> and <c>/api/status</c>: the figures of the index. Reads only.</summary>
public sealed class StatusOperation(OpenIndex index, IndexSettings settings, DriftOperation drift)
{
    public StatusReport Read()
    {
        var catalog = index.Catalog;
        var figures = catalog.Figures();
        var segments = catalog.Segments.All();
        var segmentBytes = segments.Sum(s => s.Length);
        var decision = drift.Read();
        var damage = DamageSurvey.Run(catalog, index.Store.Directory, decision.ServingEncoderId, readRecords: false, CancellationToken.None);
        var canary = CanaryReport.Of(catalog.Encoders.Find(index.Encoder.Identity.Id));
        var training = index.Serving.LastTraining(decision.ServingEncoderId);
        return new StatusReport
        {
            IndexDirectory = index.Directory,
            Documents = figures.Documents,
            Pages = figures.Pages,
            PageLocations = figures.PageLocations,
            VectorSets = catalog.VectorSets.Count(liveOnly: false),
            LiveVectorSets = catalog.VectorSets.Count(liveOnly: true),
            Segments = segments.Count,
            DeadRatio = segmentBytes == 0 ? 0 : 1.0 - ((double)segments.Sum(s => s.LiveBytes) / segmentBytes),
            ActiveEncoder = settings.Encoder.Name,
            ActiveEncoderId = index.Encoder.Identity.Id,
            ServingEncoderId = decision.ServingEncoderId,
            PagesDrifted = decision.DriftedPages.Count,
            PagesMigrated = decision.MigratedPages,
            CanaryDrifted = canary?.Drifted ?? false,
            Canary = canary,
            CandidateRecall = index.Serving.LastRecall(decision.ServingEncoderId),
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
            Quarantine = catalog.Documents.Quarantined()
                .Select(d => new QuarantineEntry(d.Root, d.Path, d.QuarantineReason?.ToString() ?? "Unknown", d.QuarantineMessage ?? string.Empty, d.LastChangedUtc.ToUniversalTime()))
                .ToList(),
            Files = FileTally.Of(catalog, figures),
        };
    }
}
