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
        var (damaged, unreadableLive) = Segments(catalog, segmentsDirectory, readRecords, null, cancellationToken);
        var (withoutVectors, notQueued) = servingEncoderId is null ? (0, 0) : PagesWithoutVectors(catalog, servingEncoderId, unreadableLive.Keys.ToHashSet(StringComparer.Ordinal));
        return Report(damaged, unreadableLive.Count, withoutVectors, notQueued);
    }

    /// <summary>
    /// The writer's cheap survey (files, headers and lengths) for its samples: a segment whose record and file
    /// are as they were at a clean inspection is not inspected again (<paramref name="clean"/>), and the pages
    /// without vectors come from the catalog's running counts (<paramref name="coverage"/>, of the serving
    /// encoder, after <see cref="RunningCounts.Refresh"/>). Costs O(segments) plus the damaged ones' records.
    /// </summary>
    public static DamageReport RunRunning(IndexCatalog catalog, string segmentsDirectory, string servingEncoderId, PageCoverage coverage, CleanSegments clean, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(catalog);
        ArgumentNullException.ThrowIfNull(coverage);
        ArgumentNullException.ThrowIfNull(clean);
        var (damaged, unreadableLive) = Segments(catalog, segmentsDirectory, readRecords: false, clean, cancellationToken);
        long withoutVectors = coverage.Referenced - coverage.CoveredServing, notQueued = coverage.UncoveredNotQueued;
        foreach (var set in unreadableLive.Values.Where(s => s.EncoderId == servingEncoderId))
        {
            // Counted as covered by its live record; its bytes cannot be read, so a search cannot find the page.
            if (catalog.Counts.PageState(servingEncoderId, set.PageKey) is { Covered: true } state)
            {
                withoutVectors++;
                notQueued += state.Queued ? 0 : 1;
            }
        }

        return Report(damaged, unreadableLive.Count, (int)withoutVectors, (int)notQueued);
    }

    private static DamageReport Report(List<SegmentDamage> damaged, int unreadableLive, int withoutVectors, int notQueued) => new()
    {
        Segments = damaged,
        SegmentsMissing = damaged.Count(d => d.Missing),
        VectorSetsUnreadable = unreadableLive,
        PagesWithoutVectors = withoutVectors,
        PagesWithoutVectorsNotQueued = notQueued,
    };

    private static (List<SegmentDamage> Damaged, Dictionary<string, VectorSetRecord> UnreadableLive) Segments(
        IndexCatalog catalog, string segmentsDirectory, bool readRecords, CleanSegments? clean, CancellationToken cancellationToken)
    {
        var damaged = new List<SegmentDamage>();
        var unreadableLive = new Dictionary<string, VectorSetRecord>(StringComparer.Ordinal);
        var segments = catalog.Segments.All();
        clean?.KeepOnly(segments.Select(s => s.Id));
        foreach (var segment in segments)
        {
            cancellationToken.ThrowIfCancellationRequested();
            var path = SegmentFileNames.PathOf(segmentsDirectory, segment.Id);
            var mark = clean is null ? default : CleanSegments.MarkOf(segment, path);
            if (clean is not null && clean.IsClean(segment.Id, mark))
            {
                continue;
            }

            var sets = catalog.VectorSets.OfSegment(segment.Id);
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
                clean?.Clean(segment.Id, mark);
                continue;
            }

            clean?.Forget(segment.Id);

            var lost = unreadable.Select(u => (Set: sets[u.Index], u.Problem)).ToList();
            var pages = lost.Where(l => l.Set.Live).Select(l => l.Set.PageKey).Distinct(StringComparer.Ordinal).ToList();
            foreach (var l in lost.Where(l => l.Set.Live))
            {
                unreadableLive[l.Set.Id] = l.Set;
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

        return (damaged, unreadableLive);
    }

    private static (int All, int NotQueued) PagesWithoutVectors(IndexCatalog catalog, string encoderId, IReadOnlySet<string> unreadable)
    {
        var covered = catalog.VectorSets.LivePageKeysOf(encoderId);
        var queued = catalog.Queue.InOrder().Select(q => q.Id).ToHashSet(StringComparer.Ordinal);
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
