using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Index;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Core.Pipeline;

/// <summary>
/// The integrity check of an index: page reference counts against the documents that hold them, every
/// segment's header against the catalog, every vector set the catalog names read back and proven by its own
/// checksum, every seal, no files the catalog does not know. It only reads: damage is reported per file with
/// what it costs (docs/recovery.md); the repair is the explicit <c>repair</c> command.
/// </summary>
/// <remarks>REQUIRES: the index lock is held (no writer is half-way through a commit).</remarks>
public static class IndexVerifier
{
    public static VerifyReport Verify(IndexCatalog catalog, PageWordStore words, string segmentsDirectory, string? activeEncoderId, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(catalog);
        ArgumentNullException.ThrowIfNull(words);
        ArgumentNullException.ThrowIfNull(segmentsDirectory);
        var report = new VerifyReport();
        var held = CheckReferences(catalog, words, report);
        CheckSegments(catalog, segmentsDirectory, activeEncoderId, report, cancellationToken);
        CheckCoverage(catalog, activeEncoderId, held, report);
        return report;
    }

    /// <summary>Checks every page's count against the documents and reads its stored words back; returns the keys a live document holds.</summary>
    private static List<string> CheckReferences(IndexCatalog catalog, PageWordStore words, VerifyReport report)
    {
        var held = new List<string>();
        var counts = new Dictionary<string, int>(StringComparer.Ordinal);
        foreach (var document in catalog.Documents.All())
        {
            report.DocumentsChecked++;
            if (document.State != DocumentState.Live)
            {
                continue;
            }

            foreach (var key in document.PageKeys)
            {
                counts[key] = counts.GetValueOrDefault(key) + 1;
            }
        }

        foreach (var page in catalog.Pages.All())
        {
            report.PagesChecked++;
            var expected = counts.GetValueOrDefault(page.Id);
            counts.Remove(page.Id);
            if (page.References > 0)
            {
                held.Add(page.Id);
            }

            if (page.References != expected && !(expected == 0 && page.References == 0))
            {
                report.Problems.Add($"page {page.Id}: the catalog counts {page.References} page locations, the documents hold {expected}");
            }

            try
            {
                PageInput.WordsOf(page, words);
            }
            catch (Exception ex) when (ex is InvalidDataException or IOException)
            {
                report.Problems.Add($"page {page.Id}: its words cannot be read ({ex.Message}); text encoders, snippets and match maps lack them until the page is read again");
            }
        }

        foreach (var (key, count) in counts)
        {
            report.Problems.Add($"page {key}: held by {count} page locations but has no page record");
        }

        return held;
    }

    private static void CheckSegments(IndexCatalog catalog, string directory, string? activeEncoderId, VerifyReport report, CancellationToken cancellationToken)
    {
        var known = catalog.Segments.All();
        var ids = known.Select(s => s.Id).ToHashSet();
        var retired = catalog.Segments.RetiredIds();
        if (Directory.Exists(directory))
        {
            foreach (var path in Directory.EnumerateFiles(directory))
            {
                var name = Path.GetFileName(path);
                if (!SegmentFileNames.TryParse(name, out var id, out var isTemp))
                {
                    report.Problems.Add($"file {name} in the segment folder is not referenced by the catalog");
                }
                else if (isTemp)
                {
                    // What a crash leaves; verify only reads, the next writing open clears it.
                    report.Notes.Add($"unfinished compaction output {name}: the next sync, scan or run removes it (its vectors are still in the segments it copies)");
                }
                else if (retired.Contains(id))
                {
                    report.Notes.Add($"segment file {name} was retired by a compaction while a reader had the index open: the writer deletes it once no reader is open (docs/catalog.md)");
                }
                else if (!ids.Contains(id))
                {
                    report.Notes.Add($"segment file {name} is not referenced by the catalog (a crash before its first commit, or a catalog older than the file): the next sync, scan or run sets it aside in segments/orphaned/; rebuild-catalog takes its vectors back");
                }
            }
        }

        var serving = catalog.Encoders.ServingId() ?? activeEncoderId;
        report.Damage = DamageSurvey.Run(catalog, directory, serving, readRecords: true, cancellationToken);
        var damaged = report.Damage.Segments.ToDictionary(d => d.SegmentId);
        foreach (var damage in report.Damage.Segments)
        {
            report.Problems.Add(Describe(damage));
        }

        foreach (var segment in known)
        {
            report.SegmentsChecked++;
            var sets = catalog.VectorSets.OfSegment(segment.Id);
            report.VectorSetsChecked += sets.Count - (damaged.TryGetValue(segment.Id, out var d) ? d.VectorSetsUnreadable.Count : 0);
            var live = sets.Where(s => s.Live).ToList();
            if (live.Count != segment.LiveRecordCount || live.Sum(s => (long)s.Length) != segment.LiveBytes || sets.Count != segment.RecordCount)
            {
                report.Problems.Add($"segment {segment.Id}: its counts (records {segment.RecordCount}, live {segment.LiveRecordCount}, live bytes {segment.LiveBytes}) differ from its vector sets ({sets.Count}, {live.Count}, {live.Sum(s => (long)s.Length)})");
            }
        }
    }

    /// <summary>One line per damaged file: what is wrong and what it costs.</summary>
    private static string Describe(SegmentDamage damage)
    {
        var what = damage.FileProblem ?? (damage.VectorSetsUnreadable.Count > 0
            ? string.Join("; ", damage.VectorSetsUnreadable.Select(u => u.Problem).Distinct(StringComparer.Ordinal).Take(3))
            : "seal: " + damage.SealProblem);
        var cost = damage.VectorSetsUnreadable.Count == 0
            ? "nothing lost (every record is proven by its own checksum); `repair` re-seals it"
            : $"{damage.VectorSetsUnreadable.Count} vector set(s) unreadable ({damage.VectorSetsUnreadable.Count(u => u.Live)} live), {damage.Pages.Count} page(s) without those vectors, {damage.Documents.Count} document(s) affected{(damage.Documents.Count == 0 ? string.Empty : ": " + string.Join(", ", damage.Documents.Take(5)) + (damage.Documents.Count > 5 ? ", …" : string.Empty))}";
        return $"segment {damage.SegmentId} ({damage.File}{(damage.Missing ? ", missing" : string.Empty)}): {what} — {cost}";
    }

    private static void CheckCoverage(IndexCatalog catalog, string? activeEncoderId, IReadOnlyList<string> held, VerifyReport report)
    {
        if (activeEncoderId is null)
        {
            return;
        }

        var queued = catalog.Queue.InOrder().Select(q => q.Id).ToHashSet(StringComparer.Ordinal);

        // During a migration the serving encoder's live vectors cover a page too (docs/encoders.md, "Drift and migration").
        var serving = catalog.Encoders.ServingId() is { } id && id != activeEncoderId ? id : null;
        foreach (var key in held)
        {
            if (catalog.VectorSets.Find(activeEncoderId, key) is not { Live: true } &&
                (serving is null || catalog.VectorSets.Find(serving, key) is not { Live: true }) &&
                !queued.Contains(key))
            {
                report.Problems.Add($"page {key} has no live vectors under the active or serving encoder and is not queued");
            }
        }
    }
}
