using IndexKeeper.Core.Compaction;

namespace IndexKeeper.Tests.Compaction;

public sealed class CompactionPolicyTests
{
    private static readonly DateTimeOffset Start = new(2031, 3, 14, 8, 0, 0, TimeSpan.Zero);

    private static readonly CompactionOptions Small = new()
    {
        DeadShareThreshold = 0.2,
        SmallSegmentBytes = 10_000,
        MinSmallSegmentsToMerge = 2,
        SimilarSizeRatio = 4,
        TargetSegmentBytes = 20_000,
    };

    [Fact]
    public void Every_plan_of_up_to_three_segments_keeps_the_rules()
    {
        long[] sizes = [1_000, 3_000, 40_000];
        double[] liveShares = [0, 0.5, 1];
        var kinds = (from sealedSegment in new[] { true, false }
                     from bytes in sizes
                     from live in liveShares
                     from encoder in new[] { "a", "b" }
                     select (sealedSegment, bytes, live, encoder)).ToArray();
        var checkedPlans = 0;
        for (var count = 0; count <= 3; count++)
        {
            foreach (var combination in Combinations(kinds.Length, count))
            {
                var segments = combination.Select((k, i) => Stats(i, kinds[k].sealedSegment, kinds[k].bytes, kinds[k].live, kinds[k].encoder, i)).ToList();
                CheckRules(segments, Small);
                checkedPlans++;
            }
        }

        Assert.Equal(1 + 36 + (36 * 36) + (36 * 36 * 36), checkedPlans);
    }

    [Fact]
    public void Every_plan_of_four_sealed_segments_of_one_encoder_keeps_the_rules()
    {
        long[] sizes = [1_000, 3_000, 9_000, 40_000];
        double[] liveShares = [0, 0.5, 0.85, 1];
        var kinds = (from bytes in sizes from live in liveShares select (bytes, live)).ToArray();
        foreach (var combination in Combinations(kinds.Length, 4))
        {
            var segments = combination.Select((k, i) => Stats(i, true, kinds[k].bytes, kinds[k].live, "a", 3 - i)).ToList();
            CheckRules(segments, WithMin(Small, 3));
        }
    }

    [Fact]
    public void Worked_example_from_the_docs()
    {
        // docs/compaction.md, "A worked example" (MiB figures, default options).
        const long MiB = 1024 * 1024;
        var segments = new List<SegmentStats>
        {
            Stats(1, true, 256 * MiB, 0.95, "e", 0, MiB),
            Stats(2, true, 256 * MiB, 0.70, "e", 1, MiB),
            Stats(3, true, 256 * MiB, 0.60, "e", 2, MiB),
            Stats(4, true, 2 * MiB, 1.0, "e", 3, MiB),
            Stats(5, true, 3 * MiB, 1.0, "e", 4, MiB),
            Stats(6, true, 5 * MiB, 1.0, "e", 5, MiB),
            Stats(7, true, 6 * MiB, 1.0, "e", 6, MiB),
            Stats(8, true, 12 * MiB, 0.0, "e", 7, MiB),
            Stats(9, false, 40 * MiB, 1.0, "e", 8, MiB),
        };
        var jobs = CompactionPolicy.Plan(segments, new CompactionOptions());
        Assert.Collection(
            jobs,
            job => Assert.Equal((CompactionReason.Drop, "8"), (job.Reason, string.Join(",", job.SegmentIds))),
            job => Assert.Equal((CompactionReason.DeadShare, "2"), (job.Reason, string.Join(",", job.SegmentIds))),
            job => Assert.Equal((CompactionReason.DeadShare, "3"), (job.Reason, string.Join(",", job.SegmentIds))),
            job => Assert.Equal((CompactionReason.SmallSegments, "4,5,6,7"), (job.Reason, string.Join(",", job.SegmentIds))));
        Assert.Equal(256 * MiB - (long)(256 * MiB * 0.7), jobs[1].ReclaimedBytes);
    }

    [Fact]
    public void Bad_options_are_all_reported()
    {
        var problems = new CompactionOptions
        {
            DeadShareThreshold = 1.5,
            SmallSegmentBytes = -1,
            MinSmallSegmentsToMerge = 1,
            SimilarSizeRatio = 0.5,
            TargetSegmentBytes = 0,
        }.Validate();
        Assert.Equal(5, problems.Count);
        Assert.Throws<ArgumentException>(() => CompactionPolicy.Plan([], new CompactionOptions { DeadShareThreshold = 0 }));
        Assert.Throws<ArgumentException>(() => CompactionPolicy.Plan([Stats(1, true, 10, 1, "a", 0), Stats(1, true, 10, 1, "a", 0)], Small));
    }

    /// <summary>The rules of docs/compaction.md, checked on one plan.</summary>
    private static void CheckRules(List<SegmentStats> segments, CompactionOptions options)
    {
        var jobs = CompactionPolicy.Plan(segments, options);
        var byId = segments.ToDictionary(s => s.SegmentId);
        var inJob = new Dictionary<long, CompactionJob>();
        foreach (var job in jobs)
        {
            var members = job.SegmentIds.Select(id => byId[id]).ToList();
            Assert.NotEmpty(members);
            Assert.All(members, m => Assert.True(m.Sealed && m.EncoderId == job.EncoderId));
            Assert.All(job.SegmentIds, id => Assert.True(inJob.TryAdd(id, job), $"segment {id} in two jobs"));
            Assert.Equal(members.Sum(m => m.Bytes), job.InputBytes);
            Assert.Equal(members.Sum(m => m.LiveBytes), job.LiveBytes);
            Assert.True(members.Count == 1 || job.LiveBytes <= options.TargetSegmentBytes, "a job of several segments exceeds the target");
            switch (job.Reason)
            {
                case CompactionReason.Drop:
                    Assert.All(members, m => Assert.Equal(0, m.LiveRecordCount));
                    break;
                case CompactionReason.DeadShare:
                    Assert.All(members, m => Assert.True(m.LiveRecordCount > 0 && m.DeadShare >= options.DeadShareThreshold));
                    break;
                case CompactionReason.SmallSegments:
                    Assert.True(members.Count >= 2);
                    Assert.All(members, m => Assert.True(m.LiveRecordCount > 0 && m.DeadShare < options.DeadShareThreshold && m.Bytes < options.SmallSegmentBytes));
                    Assert.True(members.Max(m => m.Bytes) <= members.Min(m => m.Bytes) * options.SimilarSizeRatio);
                    break;
                default:
                    Assert.Fail($"unknown reason {job.Reason}");
                    break;
            }
        }

        foreach (var segment in segments.Where(s => s.Sealed))
        {
            if (segment.LiveRecordCount == 0)
            {
                Assert.Equal(CompactionReason.Drop, inJob[segment.SegmentId].Reason);
            }
            else if (segment.DeadShare >= options.DeadShareThreshold)
            {
                Assert.Equal(CompactionReason.DeadShare, inJob[segment.SegmentId].Reason);
            }
        }

        foreach (var sameSize in segments.Where(s => s.Sealed && s.LiveRecordCount > 0 && s.DeadShare < options.DeadShareThreshold && s.Bytes < options.SmallSegmentBytes)
                     .GroupBy(s => (s.EncoderId, s.Bytes)).Where(g => g.Count() >= options.MinSmallSegmentsToMerge))
        {
            Assert.Contains(jobs, j => j.Reason == CompactionReason.SmallSegments && j.EncoderId == sameSize.Key.EncoderId);
        }

        var reversed = CompactionPolicy.Plan([.. Enumerable.Reverse(segments)], options);
        Assert.Equal(jobs.Select(j => (j.EncoderId, j.Reason, string.Join(",", j.SegmentIds))), reversed.Select(j => (j.EncoderId, j.Reason, string.Join(",", j.SegmentIds))));
    }

    private static SegmentStats Stats(long id, bool sealedSegment, long bytes, double liveShare, string encoder, int ageRank, long recordBytes = 100)
    {
        var live = (long)(bytes * liveShare);
        var records = Math.Max(1, bytes / recordBytes);
        var liveRecords = liveShare == 0 ? 0 : Math.Max(1, (long)(records * liveShare));
        return new SegmentStats(id, encoder, sealedSegment, bytes, live, records, liveRecords, Start.AddHours(ageRank));
    }

    private static CompactionOptions WithMin(CompactionOptions o, int min) => new()
    {
        DeadShareThreshold = o.DeadShareThreshold,
        SmallSegmentBytes = o.SmallSegmentBytes,
        MinSmallSegmentsToMerge = min,
        SimilarSizeRatio = o.SimilarSizeRatio,
        TargetSegmentBytes = o.TargetSegmentBytes,
    };

    /// <summary>Every sequence of <paramref name="count"/> kinds out of <paramref name="kinds"/>, repeats allowed.</summary>
    private static IEnumerable<int[]> Combinations(int kinds, int count)
    {
        var current = new int[count];
        while (true)
        {
            yield return [.. current];
            var position = count - 1;
            while (position >= 0 && ++current[position] == kinds)
            {
                current[position] = 0;
                position--;
            }

            if (position < 0)
            {
                yield break;
            }
        }
    }
}
