using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Core.Index;

/// <summary>
/// Brings the segment folder back in line with the catalog after a crash (run at every open, cheap when
/// clean): removes temp files and segments the catalog never committed, cuts bytes past an open segment's
/// committed length (a torn or uncommitted tail, or a seal the catalog never recorded), and queues again
/// the pages of vector sets whose bytes are gone.
/// </summary>
internal static class StoreRecovery
{
    public static IReadOnlyList<string> Run(IndexCatalog catalog, string directory)
    {
        var repairs = new List<string>();
        var known = catalog.Segments.All().ToDictionary(s => s.Id);
        foreach (var path in System.IO.Directory.EnumerateFiles(directory))
        {
            var name = Path.GetFileName(path);
            if (!SegmentFileNames.TryParse(name, out var id, out var isTemp))
            {
                continue;
            }

            if (isTemp || !known.ContainsKey(id))
            {
                MakeWritable(path);
                File.Delete(path);
                repairs.Add(isTemp ? $"removed unfinished compaction output {name}" : $"removed segment {name}, which no catalog commit references");
            }
        }

        foreach (var segment in known.Values)
        {
            var path = SegmentFileNames.PathOf(directory, segment.Id);
            var length = File.Exists(path) ? new FileInfo(path).Length : -1;
            if (length < segment.Length)
            {
                var lost = catalog.VectorSets.OfSegment(segment.Id).Where(v => v.Offset + v.Length > Math.Max(length, 0)).ToList();
                var requeued = catalog.ForgetVectorSets(lost, length < 0 ? [segment.Id] : []);
                repairs.Add(length < 0
                    ? $"segment {segment.Id} is missing: {lost.Count} vector sets forgotten, {requeued} pages queued again"
                    : $"segment {segment.Id} is shorter than committed: {lost.Count} vector sets forgotten, {requeued} pages queued again");
                if (length >= 0)
                {
                    segment.Length = length;
                    segment.Sealed = false;
                    catalog.Segments.Put(segment);
                }
            }
            else if (!segment.Sealed && length > segment.Length)
            {
                Cut(path, segment.Length);
                repairs.Add($"cut {length - segment.Length} uncommitted bytes from open segment {segment.Id}");
            }
        }

        return repairs;
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
        MakeWritable(path);
        using var stream = new FileStream(path, FileMode.Open, FileAccess.Write, FileShare.Read);
        stream.SetLength(length);
        stream.Flush(flushToDisk: true);
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
