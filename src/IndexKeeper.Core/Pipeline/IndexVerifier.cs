using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Index;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Core.Pipeline;

/// <summary>
/// The integrity check of an index: page reference counts against the documents that hold them, every
/// segment's header and records against the catalog, every live vector set read back with its checksum,
/// no files the catalog does not know. A damaged segment is isolated: moved to <c>segments/damaged/</c>,
/// its vector sets forgotten and their pages queued again, never read as data.
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
            if (damage is not null)
            {
                report.Problems.Add($"segment {segment.Id}: {damage}");
                Isolate(catalog, directory, segment, path, sets, report);
            }
        }
    }

    /// <summary>Returns what is wrong with one segment, or null when every record the catalog names reads back.</summary>
    private static string? CheckSegment(SegmentRecord segment, string path, IReadOnlyList<VectorSetRecord> sets, VerifyReport report)
    {
        if (!File.Exists(path))
        {
            return "its file is missing";
        }

        try
        {
            using var reader = SegmentReader.Open(path);
            if (reader.Header.EncoderId != segment.EncoderId || reader.Header.Dimensions != segment.Dimensions)
            {
                return $"its header says encoder {reader.Header.EncoderId} d={reader.Header.Dimensions}, the catalog {segment.EncoderId} d={segment.Dimensions}";
            }

            var scan = reader.Scan();
            var expectedEnd = segment.Sealed ? SegmentEnd.Sealed : SegmentEnd.Open;
            if (scan.End != expectedEnd)
            {
                return $"it ends {scan.End} at byte {scan.ValidLength} of {scan.FileLength}, the catalog expects {expectedEnd}{(scan.Problem is null ? string.Empty : ": " + scan.Problem)}";
            }

            if (scan.ValidLength != segment.Length)
            {
                return $"its valid length is {scan.ValidLength} bytes, the catalog committed {segment.Length}";
            }

            foreach (var set in sets)
            {
                var stored = reader.Read(new RecordLocation(set.SegmentId, set.Offset, set.Length, unchecked((uint)set.Checksum)));
                if (stored.Key != PageKey.Parse(set.PageKey) || stored.Count != set.VectorCount)
                {
                    return $"the record at {set.Offset} holds page {stored.Key} with {stored.Count} vectors, the catalog expects {set.PageKey} with {set.VectorCount}";
                }

                report.VectorSetsChecked++;
            }

            var live = sets.Where(s => s.Live).ToList();
            if (live.Count != segment.LiveRecordCount || live.Sum(s => (long)s.Length) != segment.LiveBytes || sets.Count != segment.RecordCount)
            {
                return $"its counts (records {segment.RecordCount}, live {segment.LiveRecordCount}, live bytes {segment.LiveBytes}) differ from its vector sets ({sets.Count}, {live.Count}, {live.Sum(s => (long)s.Length)})";
            }

            return null;
        }
        catch (Exception ex) when (ex is SegmentFormatException or IOException or ArgumentException)
        {
            return ex.Message;
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
