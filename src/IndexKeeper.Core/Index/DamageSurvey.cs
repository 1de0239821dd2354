using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Core.Index;

/// <summary>
/// Finds what the catalog names that the segment files cannot give back, and what it costs: per missing or
/// damaged file the vector sets, pages and documents affected. Only reads (reads never write): the repair
/// is <see cref="DamageRepair"/>, run by an explicit command.
/// </summary>
public static class DamageSurvey
{
    /// <param name="segmentsDirectory">The index's <c>segments/</c> folder.</param>
    /// <param name="servingEncoderId">The encoder whose vectors count for <see cref="DamageReport.PagesWithoutVectors"/>; null: not counted.</param>
    /// <param name="readRecords">True reads every record and seal (verify); false checks files, headers and lengths only (status, health).</param>
    public static DamageReport Run(IndexCatalog catalog, string segmentsDirectory, string? servingEncoderId, bool readRecords, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(catalog);
        ArgumentNullException.ThrowIfNull(segmentsDirectory);
        var damaged = new List<SegmentDamage>();
        var unreadableLive = new HashSet<string>(StringComparer.Ordinal);
        foreach (var segment in catalog.Segments.All())
        {
            cancellationToken.ThrowIfCancellationRequested();
            var sets = catalog.VectorSets.OfSegment(segment.Id);
            var path = SegmentFileNames.PathOf(segmentsDirectory, segment.Id);
            var locations = sets.Select(s => new RecordLocation(s.SegmentId, s.Offset, s.Length, unchecked((uint)s.Checksum))).ToList();
            var inspection = SegmentInspector.Inspect(path, segment.Id, locations, segment.Sealed, readRecords);
            var fileProblem = inspection.FileProblem;
            var unreadable = inspection.Unreadable;
            if (fileProblem is null && inspection.Header is { } header && (header.EncoderId != segment.EncoderId || header.Dimensions != segment.Dimensions))
            {
                fileProblem = $"its header says encoder {header.EncoderId} d={header.Dimensions}, the catalog {segment.EncoderId} d={segment.Dimensions}";
                unreadable = locations.Select((l, i) => new UnreadableRecord(i, l, fileProblem)).ToList();
            }

            if (fileProblem is null && unreadable.Count == 0 && inspection.SealProblem is null)
            {
                continue;
            }

            var lost = unreadable.Select(u => (Set: sets[u.Index], u.Problem)).ToList();
            var pages = lost.Where(l => l.Set.Live).Select(l => l.Set.PageKey).Distinct(StringComparer.Ordinal).ToList();
            foreach (var l in lost.Where(l => l.Set.Live))
            {
                unreadableLive.Add(l.Set.Id);
            }

            damaged.Add(new SegmentDamage
            {
                SegmentId = segment.Id,
                File = SegmentFileNames.Name(segment.Id),
                Missing = inspection.Missing,
                FileProblem = fileProblem,
                SealProblem = inspection.SealProblem,
                VectorSetsUnreadable = lost.Select(l => new UnreadableVectorSet(l.Set.EncoderId, l.Set.PageKey, l.Set.Offset, l.Set.Live, l.Problem)).ToList(),
                Pages = pages,
                Documents = pages.SelectMany(catalog.Documents.Holding).Select(d => d.Root + "/" + d.Path).Distinct(StringComparer.Ordinal).Order(StringComparer.Ordinal).ToList(),
            });
        }

        var (withoutVectors, notQueued) = servingEncoderId is null ? (0, 0) : PagesWithoutVectors(catalog, servingEncoderId, unreadableLive);
        return new DamageReport
        {
            Segments = damaged,
            SegmentsMissing = damaged.Count(d => d.Missing),
            VectorSetsUnreadable = unreadableLive.Count,
            PagesWithoutVectors = withoutVectors,
            PagesWithoutVectorsNotQueued = notQueued,
        };
    }

    private static (int All, int NotQueued) PagesWithoutVectors(IndexCatalog catalog, string encoderId, IReadOnlySet<string> unreadable)
    {
        var covered = catalog.VectorSets.LivePageKeysOf(encoderId);
        var queued = catalog.Queue.Keys().Select(q => q.PageKey).ToHashSet(StringComparer.Ordinal);
        int all = 0, notQueued = 0;
        foreach (var key in catalog.Pages.ReferencedKeys())
        {
            if (covered.Contains(key) && !unreadable.Contains(VectorSetRecord.MakeId(encoderId, key)))
            {
                continue;
            }

            all++;
            if (!queued.Contains(key))
            {
                notQueued++;
            }
        }

        return (all, notQueued);
    }
}
