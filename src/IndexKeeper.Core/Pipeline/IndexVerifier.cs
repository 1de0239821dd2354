using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Index;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Core.Pipeline;

/// <summary>
/// The integrity check of an index: page reference counts against the documents that hold them, every
/// segment's header and records against the catalog, every live vector set read back with its checksum,
/// no files the catalog does not know. Damage stays local: a record that does not read back costs its own
/// vector set (forgotten, its page queued again); a bad closing record with intact records loses nothing; only
/// a segment that cannot be read at all (missing, header damaged or of another encoder) is isolated in
/// <c>segments/damaged/</c> with all its vector sets. Nothing damaged is ever read as data.
/// </summary>
/// <remarks>REQUIRES: the index lock is held and the store was opened (recovery ran).</remarks>
public static class IndexVerifier
{
    public const string DamagedFolder = "damaged";

    public static VerifyReport Verify(IndexCatalog catalog, VectorStore store, string? activeEncoderId, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(catalog);
        ArgumentNullException.ThrowIfNull(store);
        var report = new VerifyReport();
        report.Repairs.AddRange(store.Repairs.Select(r => "at open: " + r));
        var held = CheckReferences(catalog, report);
        CheckSegments(catalog, store.Directory, report, cancellationToken);
        CheckCoverage(catalog, activeEncoderId, held, report);
        return report;
    }

    /// <summary>Checks every page's count against the documents; returns the keys a live document holds.</summary>
    private static List<string> CheckReferences(IndexCatalog catalog, VerifyReport report)
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
        }

        foreach (var (key, count) in counts)
        {
            report.Problems.Add($"page {key}: held by {count} page locations but has no page record");
        }

        return held;
    }

    private static void CheckSegments(IndexCatalog catalog, string directory, VerifyReport report, CancellationToken cancellationToken)
    {
        var known = catalog.Segments.All().ToDictionary(s => s.Id);
        foreach (var path in Directory.EnumerateFiles(directory))
        {
            if (!SegmentFileNames.TryParse(Path.GetFileName(path), out var id, out _) || !known.ContainsKey(id))
            {
                report.Problems.Add($"file {Path.GetFileName(path)} in the segment folder is not referenced by the catalog");
            }
        }

        foreach (var segment in known.Values)
        {
            cancellationToken.ThrowIfCancellationRequested();
            report.SegmentsChecked++;
            var path = SegmentFileNames.PathOf(directory, segment.Id);
            var sets = catalog.VectorSets.OfSegment(segment.Id);
            var damage = CheckSegment(segment, path, sets, report);
            foreach (var problem in damage.Problems)
            {
                report.Problems.Add($"segment {segment.Id}: {problem}");
            }

            if (damage.Whole)
            {
                Isolate(catalog, directory, segment, path, sets, report);
            }
            else if (damage.Lost.Count > 0)
            {
                // Each record carries its own checksum: a bad one costs that vector set, never its neighbours.
                var requeued = catalog.ForgetVectorSets(damage.Lost, []);
                report.Repairs.Add($"segment {segment.Id}: {damage.Lost.Count} damaged vector set(s) forgotten, {requeued} page(s) queued again; its other {sets.Count - damage.Lost.Count} read back and are kept");
            }
        }
    }

    /// <summary>What is wrong with one segment: problems to report, and either the whole file (it cannot be read as this segment at all) or the vector sets whose records do not read back.</summary>
    private sealed record SegmentDamage(IReadOnlyList<string> Problems, bool Whole, IReadOnlyList<VectorSetRecord> Lost)
    {
        public static SegmentDamage Of(string wholeProblem) => new([wholeProblem], true, []);
    }

    private static SegmentDamage CheckSegment(SegmentRecord segment, string path, IReadOnlyList<VectorSetRecord> sets, VerifyReport report)
    {
        if (!File.Exists(path))
        {
            return SegmentDamage.Of($"its file is missing: {sets.Count} vector set(s) cannot be read");
        }

        SegmentReader reader;
        try
        {
            reader = SegmentReader.Open(path);
        }
        catch (Exception ex) when (ex is SegmentFormatException or IOException or ArgumentException)
        {
            return SegmentDamage.Of(ex.Message);
        }

        using (reader)
        {
            if (reader.Header.EncoderId != segment.EncoderId || reader.Header.Dimensions != segment.Dimensions)
            {
                return SegmentDamage.Of($"its header says encoder {reader.Header.EncoderId} d={reader.Header.Dimensions}, the catalog {segment.EncoderId} d={segment.Dimensions}");
            }

            var problems = new List<string>();
            var scan = reader.Scan();
            var expectedEnd = segment.Sealed ? SegmentEnd.Sealed : SegmentEnd.Open;
            if (scan.End != expectedEnd || scan.ValidLength != segment.Length)
            {
                // The closing record or a stretch between records: the committed records are proven by their own
                // checksums below, so this alone loses nothing (docs/recovery.md).
                problems.Add($"it ends {scan.End} at byte {scan.ValidLength} of {scan.FileLength}, the catalog expects {expectedEnd} at {segment.Length}{(scan.Problem is null ? string.Empty : ": " + scan.Problem)}");
            }

            var lost = new List<VectorSetRecord>();
            foreach (var set in sets)
            {
                try
                {
                    var stored = reader.Read(new RecordLocation(set.SegmentId, set.Offset, set.Length, unchecked((uint)set.Checksum)));
                    if (stored.Key != PageKey.Parse(set.PageKey) || stored.Count != set.VectorCount)
                    {
                        problems.Add($"the record at {set.Offset} holds page {stored.Key} with {stored.Count} vectors, the catalog expects {set.PageKey} with {set.VectorCount}");
                        lost.Add(set);
                        continue;
                    }
                }
                catch (Exception ex) when (ex is SegmentFormatException or IOException or ArgumentException)
                {
                    problems.Add($"the record of page {set.PageKey} at {set.Offset} does not read back: {ex.Message}");
                    lost.Add(set);
                    continue;
                }

                report.VectorSetsChecked++;
            }

            var live = sets.Where(s => s.Live).ToList();
            if (live.Count != segment.LiveRecordCount || live.Sum(s => (long)s.Length) != segment.LiveBytes || sets.Count != segment.RecordCount)
            {
                problems.Add($"its counts (records {segment.RecordCount}, live {segment.LiveRecordCount}, live bytes {segment.LiveBytes}) differ from its vector sets ({sets.Count}, {live.Count}, {live.Sum(s => (long)s.Length)})");
            }

            return new SegmentDamage(problems, false, lost);
        }
    }

    private static void Isolate(IndexCatalog catalog, string directory, SegmentRecord segment, string path, IReadOnlyList<VectorSetRecord> sets, VerifyReport report)
    {
        if (File.Exists(path))
        {
            var damaged = Path.Combine(directory, DamagedFolder);
            Directory.CreateDirectory(damaged);
            File.Move(path, Path.Combine(damaged, Path.GetFileName(path) + "." + DateTime.UtcNow.ToString("yyyyMMddHHmmss", System.Globalization.CultureInfo.InvariantCulture)), overwrite: true);
        }

        var requeued = catalog.ForgetVectorSets(sets, [segment.Id]);
        report.Repairs.Add($"isolated segment {segment.Id} in {DamagedFolder}/: {sets.Count} vector sets forgotten, {requeued} pages queued again");
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
