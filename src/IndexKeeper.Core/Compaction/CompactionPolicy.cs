namespace IndexKeeper.Core.Compaction;

/// <summary>
/// Chooses compaction jobs from segment statistics (docs/compaction.md). Pure: plain data in, plain
/// data out, the same answer for the same segments in any order. Rules, per encoder:
/// <list type="number">
/// <item>Only sealed segments are touched; the open one is still being written.</item>
/// <item>Sealed segments with no live vector set are dropped (one job, nothing copied).</item>
/// <item>Sealed segments whose dead share reached the threshold are rewritten, oldest first, packed
/// into jobs of at most the target size of live bytes.</item>
/// <item>The remaining small segments are sorted by size and cut into runs of similar size; a run of at
/// least the minimum count is merged, packed the same way; a packed job of one segment is left out
/// (rewriting one segment alone gains nothing).</item>
/// </list>
/// </summary>
public static class CompactionPolicy
{
    public static IReadOnlyList<CompactionJob> Plan(IReadOnlyList<SegmentStats> segments, CompactionOptions options)
    {
        ArgumentNullException.ThrowIfNull(segments);
        ArgumentNullException.ThrowIfNull(options);
        options.ThrowIfInvalid();
        if (segments.Select(s => s.SegmentId).Distinct().Count() != segments.Count)
        {
            throw new ArgumentException("Segment ids must be unique.", nameof(segments));
        }

        var jobs = new List<CompactionJob>();
        foreach (var encoder in segments.Where(s => s.Sealed).GroupBy(s => s.EncoderId).OrderBy(g => g.Key, StringComparer.Ordinal))
        {
            var sealedSegments = encoder.OrderBy(s => s.Created).ThenBy(s => s.SegmentId).ToList();
            var empty = sealedSegments.Where(s => s.LiveRecordCount == 0).ToList();
            if (empty.Count > 0)
            {
                jobs.Add(Job(encoder.Key, empty, CompactionReason.Drop));
            }

            var withLive = sealedSegments.Where(s => s.LiveRecordCount > 0).ToList();
            var dead = withLive.Where(s => s.DeadShare >= options.DeadShareThreshold).ToList();
            jobs.AddRange(Pack(dead, options.TargetSegmentBytes).Select(group => Job(encoder.Key, group, CompactionReason.DeadShare)));

            var small = withLive.Where(s => s.DeadShare < options.DeadShareThreshold && s.Bytes < options.SmallSegmentBytes)
                .OrderBy(s => s.Bytes).ThenBy(s => s.SegmentId).ToList();
            foreach (var run in SimilarSizeRuns(small, options.SimilarSizeRatio).Where(r => r.Count >= options.MinSmallSegmentsToMerge))
            {
                var oldestFirst = run.OrderBy(s => s.Created).ThenBy(s => s.SegmentId).ToList();
                jobs.AddRange(Pack(oldestFirst, options.TargetSegmentBytes).Where(g => g.Count >= 2)
                    .Select(group => Job(encoder.Key, group, CompactionReason.SmallSegments)));
            }
        }

        return jobs;
    }

    /// <summary>Cuts segments sorted by size into maximal runs whose largest is at most <paramref name="ratio"/> times the first.</summary>
    private static List<List<SegmentStats>> SimilarSizeRuns(List<SegmentStats> bySize, double ratio)
    {
        var runs = new List<List<SegmentStats>>();
        foreach (var segment in bySize)
        {
            if (runs.Count == 0 || segment.Bytes > Math.Max(runs[^1][0].Bytes, 1) * ratio)
            {
                runs.Add([]);
            }

            runs[^1].Add(segment);
        }

        return runs;
    }

    /// <summary>Packs segments in order into groups whose live bytes stay within the target (a bigger one goes alone).</summary>
    private static List<List<SegmentStats>> Pack(List<SegmentStats> segments, long target)
    {
        var groups = new List<List<SegmentStats>>();
        long live = 0;
        foreach (var segment in segments)
        {
            if (groups.Count == 0 || live + segment.LiveBytes > target)
            {
                groups.Add([]);
                live = 0;
            }

            groups[^1].Add(segment);
            live += segment.LiveBytes;
        }

        return groups;
    }

    private static CompactionJob Job(string encoderId, List<SegmentStats> group, CompactionReason reason) =>
        new(encoderId, [.. group.Select(s => s.SegmentId)], reason, group.Sum(s => s.Bytes), group.Sum(s => s.LiveBytes));
}
