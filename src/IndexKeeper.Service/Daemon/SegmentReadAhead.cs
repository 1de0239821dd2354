using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Service.Daemon;

/// <summary>
/// Part of the daemon's warm-up: reads the serving encoder's segment files once, front to back, so that the
/// operating system's page cache holds them and the first searches after a start open the records they re-rank
/// from memory, not from disk. A reboot empties that cache: at 100,000 pages a first search then took 240 ms
/// against 70 ms with the segments cached (docs/benchmarks.md, `idle`, run 7). Only when the files fit in a
/// quarter of the memory the runtime may use, so a large index on a small machine does not push everything
/// else out of the cache. Reads only.
/// </summary>
internal static class SegmentReadAhead
{
    private const int ChunkBytes = 1 << 20;

    /// <summary>True when segments of <paramref name="segmentBytes"/> are read ahead on a machine of <paramref name="memoryBytes"/>.</summary>
    public static bool Fits(long segmentBytes, long memoryBytes) => segmentBytes <= memoryBytes / 4;

    /// <summary>The serving encoder's segments and their bytes, as the catalog records them.</summary>
    public static (IReadOnlyList<long> Segments, long Bytes) Of(IndexCatalog catalog, string encoderId)
    {
        ArgumentNullException.ThrowIfNull(catalog);
        var segments = catalog.Segments.All().Where(s => s.EncoderId == encoderId).ToList();
        return ([.. segments.Select(s => s.Id)], segments.Sum(s => s.Length));
    }

    /// <summary>Reads each segment file through once and returns the bytes read; a file gone meanwhile (compacted away) is skipped.</summary>
    public static long Read(string segmentsDirectory, IReadOnlyList<long> segments, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(segments);
        var buffer = new byte[ChunkBytes];
        long read = 0;
        foreach (var id in segments)
        {
            try
            {
                // Shared with the writer, and deletable meanwhile: compaction may retire the segment while it is read.
                using var file = new FileStream(
                    SegmentFileNames.PathOf(segmentsDirectory, id), FileMode.Open, FileAccess.Read, FileShare.ReadWrite | FileShare.Delete, ChunkBytes, FileOptions.SequentialScan);
                int n;
                while ((n = file.Read(buffer, 0, buffer.Length)) > 0)
                {
                    cancellationToken.ThrowIfCancellationRequested();
                    read += n;
                }
            }
            catch (FileNotFoundException)
            {
                // Retired by a compaction since the list was taken; a missing file the catalog still names is
                // reported by the damage survey, not here.
            }
        }

        return read;
    }
}
