using IndexKeeper.Core.Catalog;

namespace IndexKeeper.Core.Index;

/// <summary>
/// Segments a cheap inspection (files, headers and lengths) found clean, each with what it saw: the segment's
/// record and its file's length and last write. While both are unchanged the file would pass again, so the
/// writer's samples skip it (<see cref="DamageSurvey.RunRunning"/>). Held in memory by one process.
/// </summary>
public sealed class CleanSegments
{
    private readonly Dictionary<long, SegmentMark> clean = [];

    /// <summary>What a clean inspection depends on: the record's fields that name the file's shape, and the file's length and last write.</summary>
    internal readonly record struct SegmentMark(string EncoderId, int Dimensions, bool Sealed, long Length, long RecordCount, long FileLength, long FileWrittenTicks);

    internal static SegmentMark MarkOf(SegmentRecord segment, string path)
    {
        ArgumentNullException.ThrowIfNull(segment);
        var file = new FileInfo(path);
        return file.Exists
            ? new SegmentMark(segment.EncoderId, segment.Dimensions, segment.Sealed, segment.Length, segment.RecordCount, file.Length, file.LastWriteTimeUtc.Ticks)
            : new SegmentMark(segment.EncoderId, segment.Dimensions, segment.Sealed, segment.Length, segment.RecordCount, -1, 0);
    }

    internal bool IsClean(long segmentId, SegmentMark mark) => clean.TryGetValue(segmentId, out var seen) && seen == mark;

    internal void Clean(long segmentId, SegmentMark mark) => clean[segmentId] = mark;

    internal void Forget(long segmentId) => clean.Remove(segmentId);

    /// <summary>Forgets segments the catalog no longer names.</summary>
    internal void KeepOnly(IEnumerable<long> segmentIds)
    {
        var keep = segmentIds.ToHashSet();
        foreach (var id in clean.Keys.Where(id => !keep.Contains(id)).ToList())
        {
            clean.Remove(id);
        }
    }
}
