using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Faults;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Core.Index;

/// <summary>
/// Brings the segment folder back in line with the catalog after a crash (run at every open, cheap when
/// clean): removes unfinished compaction outputs, sets segments the catalog never committed aside in
/// <c>segments/orphaned/</c> (never deletes them: the catalog may be an older copy), cuts bytes past an open segment's
/// committed length (a torn or uncommitted tail, or a seal the catalog never recorded), and queues again
/// the pages of vector sets past the end of a file shorter than committed. A missing file is left to the
/// explicit <c>repair</c>: its records stay and are reported as damage.
/// </summary>
internal static class StoreRecovery
{
    /// <summary>The folder inside <c>segments/</c> where files no catalog commit references are set aside.</summary>
    public const string OrphanedFolder = "orphaned";

    public static IReadOnlyList<string> Run(IndexCatalog catalog, string directory)
    {
        var repairs = new List<string>();
        var retired = DeleteRetired(catalog, directory);
        var known = catalog.Segments.All().ToDictionary(s => s.Id);
        foreach (var path in System.IO.Directory.EnumerateFiles(directory))
        {
            var name = Path.GetFileName(path);
            if (!SegmentFileNames.TryParse(name, out var id, out var isTemp))
            {
                continue;
            }

            if (isTemp)
            {
                // A compaction output before its swap: a copy of vectors its inputs still hold.
                FaultInjection.Reach(FaultPoints.RecoveryDeleteTemp);
                MakeWritable(path);
                File.Delete(path);
                repairs.Add($"removed unfinished compaction output {name}");
            }
            else if (!known.ContainsKey(id) && !retired.Contains(id))
            {
                // Most often a segment a crash left before its first commit; but after a catalog restored from
                // an older backup it holds real vectors, so it is set aside, never deleted on that guess.
                repairs.Add($"moved segment {name}, which no catalog commit references, to {OrphanedFolder}/{SetAside(directory, path)}");
            }
        }

        foreach (var segment in known.Values)
        {
            var path = SegmentFileNames.PathOf(directory, segment.Id);
            if (!File.Exists(path))
            {
                // The file may come back (a restore, a disk mounted late): its records stay, reported as damage
                // by status, verify and /health, until the explicit `repair` drops them.
                repairs.Add($"segment {segment.Id} is missing: its vector sets stay in the catalog, reported as damage; put the file back or run `repair`");
                continue;
            }

            var length = new FileInfo(path).Length;
            if (length < segment.Length)
            {
                var lost = catalog.VectorSets.OfSegment(segment.Id).Where(v => v.Offset + v.Length > length).ToList();
                var requeued = catalog.ForgetVectorSets(lost, []);
                repairs.Add($"segment {segment.Id} is shorter than committed: {lost.Count} vector sets forgotten, {requeued} pages queued again");
                segment.Length = length;
                segment.Sealed = false;
                catalog.Segments.Put(segment);
            }
            else if (!segment.Sealed && length > segment.Length)
            {
                Cut(path, segment.Length);
                repairs.Add($"cut {length - segment.Length} uncommitted bytes from open segment {segment.Id}");
            }
        }

        return repairs;
    }

    /// <summary>
    /// Deletes the files of segments an earlier compaction retired whose delete a reader put off, when no
    /// reader is open now; returns the retired segments whose files are still there.
    /// </summary>
    private static IReadOnlySet<long> DeleteRetired(IndexCatalog catalog, string directory)
    {
        var retired = catalog.Segments.RetiredIds();
        if (retired.Count == 0)
        {
            return retired;
        }

        var gone = new List<long>();
        using (var readersOut = ReaderGate.TryEnterExclusive(Path.GetDirectoryName(Path.GetFullPath(directory))!))
        {
            foreach (var id in retired)
            {
                var path = SegmentFileNames.PathOf(directory, id);
                if (File.Exists(path) && readersOut is not null)
                {
                    FaultInjection.Reach(FaultPoints.CompactionDeleteBefore);
                    MakeWritable(path);
                    File.Delete(path);
                    FaultInjection.Reach(FaultPoints.CompactionDeleteAfter);
                }

                if (!File.Exists(path))
                {
                    gone.Add(id);
                }
            }
        }

        catalog.Segments.ForgetRetired(gone);
        return retired.Except(gone).ToHashSet();
    }

    /// <summary>After a failed append: cuts every open segment back to what the catalog committed.</summary>
    public static void CutToCommitted(IndexCatalog catalog, string directory)
    {
        foreach (var segment in catalog.Segments.All().Where(s => !s.Sealed))
        {
            var path = SegmentFileNames.PathOf(directory, segment.Id);
            if (File.Exists(path) && new FileInfo(path).Length > segment.Length)
            {
                Cut(path, segment.Length);
            }
        }
    }

    private static void Cut(string path, long length)
    {
        FaultInjection.Reach(FaultPoints.RecoveryCutBefore);
        MakeWritable(path);
        using (var stream = new FileStream(path, FileMode.Open, FileAccess.Write, FileShare.Read))
        {
            stream.SetLength(length);
            stream.Flush(flushToDisk: true);
        }

        FaultInjection.Reach(FaultPoints.RecoveryCutAfter);
    }

    /// <summary>Moves a file into the orphaned folder under a name not yet taken there; returns that name.</summary>
    private static string SetAside(string directory, string path)
    {
        FaultInjection.Reach(FaultPoints.RecoverySetAside);
        var folder = Path.Combine(directory, OrphanedFolder);
        System.IO.Directory.CreateDirectory(folder);
        var name = Path.GetFileName(path);
        for (var n = 1; File.Exists(Path.Combine(folder, name)); n++)
        {
            name = Path.GetFileName(path) + "." + n.ToString(System.Globalization.CultureInfo.InvariantCulture);
        }

        File.Move(path, Path.Combine(folder, name));
        return name;
    }

    private static void MakeWritable(string path)
    {
        var attributes = File.GetAttributes(path);
        if ((attributes & FileAttributes.ReadOnly) != 0)
        {
            File.SetAttributes(path, attributes & ~FileAttributes.ReadOnly);
        }
    }
}
