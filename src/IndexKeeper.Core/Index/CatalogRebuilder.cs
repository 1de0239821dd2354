using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Core.Index;

/// <summary>
/// Rebuilds a lost or damaged catalog from the self-describing segments (docs/segment-format.md: the header
/// names the encoder and d, every record its page key), so that a rescan of the roots finds the vector
/// sets by page key and costs no encoder call for pages whose vectors survive (docs/recovery.md). Never
/// deletes or rewrites a segment file; the old catalog is moved aside, not deleted.
/// </summary>
/// <remarks>REQUIRES: the index lock is held for the whole rebuild, from <see cref="MoveCatalogAside"/> on.</remarks>
public static class CatalogRebuilder
{
    /// <summary>The encoder ids and d named by the segment headers (files whose header cannot be read are left out).</summary>
    public static IReadOnlyDictionary<string, int> EncodersIn(string segmentsDirectory)
    {
        var found = new Dictionary<string, int>(StringComparer.Ordinal);
        foreach (var (_, path) in SegmentFiles(segmentsDirectory))
        {
            try
            {
                using var reader = SegmentReader.Open(path);
                found[reader.Header.EncoderId] = reader.Header.Dimensions;
            }
            catch (Exception ex) when (ex is SegmentFormatException or IOException or UnauthorizedAccessException)
            {
                // Reported by Restore; here only the encoders matter.
            }
        }

        return found;
    }

    /// <summary>Moves <c>catalog.db</c> (and LiteDB's log beside it) to a name with the time; returns the new path, or null when there was none.</summary>
    public static string? MoveCatalogAside(string indexDirectory, DateTime nowUtc)
    {
        var catalog = Path.Combine(indexDirectory, CatalogSchema.FileName);
        var suffix = ".before-rebuild-" + nowUtc.ToString("yyyyMMdd'T'HHmmss'Z'", System.Globalization.CultureInfo.InvariantCulture);
        var log = Path.Combine(indexDirectory, Path.GetFileNameWithoutExtension(CatalogSchema.FileName) + "-log" + Path.GetExtension(CatalogSchema.FileName));
        if (File.Exists(log))
        {
            File.Move(log, log + suffix);
        }

        if (!File.Exists(catalog))
        {
            return null;
        }

        File.Move(catalog, catalog + suffix);
        return catalog + suffix;
    }

    /// <summary>
    /// Writes into a new, empty catalog every segment file and every good record found in it, each vector set
    /// dead until a scan finds a live document holding its page key (which makes it live again, as a restored
    /// file's page is). A segment the walk finds damaged is recorded as sealed with its whole length, so that
    /// nothing appends to it or cuts it; <c>verify</c> reports it.
    /// </summary>
    public static CatalogRebuild Restore(IndexCatalog catalog, string segmentsDirectory, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(catalog);
        var result = new CatalogRebuild();
        var newest = new Dictionary<(string Encoder, string Key), (SegmentRecord Segment, ScannedRecord Record)>();
        var segments = new List<SegmentRecord>();
        TakeBackSetAside(segmentsDirectory, result);
        foreach (var (id, path) in SegmentFiles(segmentsDirectory))
        {
            cancellationToken.ThrowIfCancellationRequested();
            try
            {
                SegmentHeader header;
                SegmentScan scan;
                long length;
                bool sealedWithDamage;
                using (var reader = SegmentReader.Open(path))
                {
                    header = reader.Header;
                    scan = reader.Scan();
                    length = reader.Length;
                    sealedWithDamage = reader.IsSealed || scan.DamageOffset == reader.Length - SegmentFormat.SealRecordLength;
                }

                if (header.SegmentId != id)
                {
                    result.Problems.Add($"{Path.GetFileName(path)}: the header names segment {header.SegmentId}; left out");
                    continue;
                }

                var clean = scan.End is SegmentEnd.Sealed or SegmentEnd.Open or SegmentEnd.TornTail;
                if (!clean)
                {
                    // A damaged file is never appended to again: an unsealed one is sealed as it is (40 bytes
                    // appended, nothing changed), so verify finds a whole seal and the damage costs one record.
                    var sealing = sealedWithDamage ? null : SegmentResealer.SealAfterDamage(path);
                    length = new FileInfo(path).Length;
                    result.Problems.Add($"{Path.GetFileName(path)}: {scan.Problem} at byte {scan.DamageOffset}; {scan.Records.Count} record(s) before it and {scan.RecordsAfterDamage.Count} good one(s) after it taken back" +
                        (sealedWithDamage ? string.Empty : sealing is null ? "; the unsealed file was sealed as it is" : "; not sealed: " + sealing));
                }

                var segment = new SegmentRecord
                {
                    Id = id,
                    EncoderId = header.EncoderId,
                    Dimensions = header.Dimensions,
                    Sealed = scan.End == SegmentEnd.Sealed || !clean,
                    Length = scan.End == SegmentEnd.Sealed || !clean ? length : scan.ValidLength,
                    CreatedUtc = header.Created.UtcDateTime,
                };
                segments.Add(segment);
                result.Encoders[segment.EncoderId] = segment.Dimensions;
                foreach (var record in scan.Records.Concat(scan.RecordsAfterDamage))
                {
                    // Ids only grow and offsets within a file too: the later record is the one written last.
                    if (newest.ContainsKey((segment.EncoderId, record.Key.Hex)))
                    {
                        result.DuplicateRecords++;
                    }

                    newest[(segment.EncoderId, record.Key.Hex)] = (segment, record);
                }
            }
            catch (Exception ex) when (ex is SegmentFormatException or IOException or UnauthorizedAccessException)
            {
                result.Problems.Add($"{Path.GetFileName(path)}: {ex.Message}; left out");
            }
        }

        foreach (var segment in segments)
        {
            var added = newest.Values.Where(n => n.Segment.Id == segment.Id).Select(n => new VectorSetRecord
            {
                Id = VectorSetRecord.MakeId(segment.EncoderId, n.Record.Key.Hex),
                EncoderId = segment.EncoderId,
                PageKey = n.Record.Key.Hex,
                SegmentId = segment.Id,
                Offset = n.Record.Location.Offset,
                Length = n.Record.Location.Length,
                Checksum = n.Record.Location.Checksum,
                VectorCount = n.Record.VectorCount,
            }).ToList();
            catalog.CommitEmbedded(segment, added, []);
            catalog.Segments.ReserveIdsThrough(segment.Id);
            result.SegmentsRestored++;
            result.VectorSetsRestored += added.Count;
        }

        return result;
    }

    /// <summary>
    /// After the rescan: takes out of the queue every page that has a live vector set of
    /// <paramref name="encoderId"/> again (the scan queued them as new), so the next run embeds only pages
    /// whose vectors did not survive. Returns how many were taken out.
    /// </summary>
    public static int DequeueCovered(IndexCatalog catalog, string encoderId)
    {
        ArgumentNullException.ThrowIfNull(catalog);
        var covered = catalog.VectorSets.LivePageKeysOf(encoderId);
        var satisfied = catalog.Queue.InOrder().Select(q => q.Id).Where(covered.Contains).ToList();
        catalog.Queue.Remove(satisfied);
        return satisfied.Count;
    }

    /// <summary>
    /// Moves the segment files that recovery set aside in <c>orphaned/</c> and <c>repair</c> in <c>damaged/</c>
    /// back to their own names, so their good records are taken back like any other: they were set aside
    /// because the old catalog did not name them or could not read them, and that catalog is gone. A file whose
    /// header cannot be read, or whose id another file already holds, stays where it is and is reported.
    /// </summary>
    private static void TakeBackSetAside(string segmentsDirectory, CatalogRebuild result)
    {
        foreach (var folder in new[] { StoreRecovery.OrphanedFolder, DamageRepair.DamagedFolder })
        {
            var aside = Path.Combine(segmentsDirectory, folder);
            if (!Directory.Exists(aside))
            {
                continue;
            }

            foreach (var path in Directory.EnumerateFiles(aside, SegmentFileNames.Prefix + "*").Order(StringComparer.Ordinal))
            {
                var shown = folder + "/" + Path.GetFileName(path);
                long id;
                try
                {
                    using var reader = SegmentReader.Open(path);
                    id = reader.Header.SegmentId;
                }
                catch (Exception ex) when (ex is SegmentFormatException or IOException or UnauthorizedAccessException)
                {
                    result.Problems.Add($"{shown}: {ex.Message}; left where it is");
                    continue;
                }

                var target = SegmentFileNames.PathOf(segmentsDirectory, id);
                if (File.Exists(target))
                {
                    result.Problems.Add($"{shown}: segment {id} is already in the segments folder; left where it is");
                    continue;
                }

                File.Move(path, target);
                result.FilesTakenBack.Add($"{shown} moved back to {SegmentFileNames.Name(id)}");
            }
        }
    }

    private static IEnumerable<(long Id, string Path)> SegmentFiles(string segmentsDirectory)
    {
        if (!Directory.Exists(segmentsDirectory))
        {
            yield break;
        }

        foreach (var path in Directory.EnumerateFiles(segmentsDirectory).Order(StringComparer.Ordinal))
        {
            if (SegmentFileNames.TryParse(Path.GetFileName(path), out var id, out var isTemp) && !isTemp)
            {
                yield return (id, path);
            }
        }
    }
}
