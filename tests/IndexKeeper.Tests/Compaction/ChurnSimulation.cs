using IndexKeeper.Core.Compaction;

namespace IndexKeeper.Tests.Compaction;

/// <summary>
/// A model of an index under steady churn, in bytes only: each round kills a share of the live vector
/// sets, appends as many new ones to the open segment (sealed at its size limit), then applies the
/// policy's jobs as the compactor would (live records copied into segments of the target size).
/// </summary>
internal sealed class ChurnSimulation
{
    // Sizes of the real format for 1,030 vectors × 128-d (docs/segment-format.md, worked example).
    public const long RecordBytes = 296_696;
    public const long SegmentOverhead = 112 + 40;

    private readonly CompactionOptions options;
    private readonly long sealAtBytes;
    private readonly Random random;
    private readonly Dictionary<long, Segment> segments = [];
    private long nextSegmentId;
    private long nextRecord;
    private Segment? open;
    private DateTimeOffset now = new(2031, 1, 1, 0, 0, 0, TimeSpan.Zero);

    public ChurnSimulation(CompactionOptions options, long sealAtBytes, int seed)
    {
        this.options = options;
        this.sealAtBytes = sealAtBytes;
        random = new Random(seed);
    }

    public long IngestedBytes { get; private set; }

    public long CompactionWrittenBytes { get; private set; }

    public long BytesOnDisk => segments.Values.Sum(s => s.Bytes);

    public long LiveBytes => segments.Values.Sum(s => s.Live.Count) * RecordBytes;

    public double SpaceAmplification => (double)BytesOnDisk / LiveBytes;

    public double WriteAmplification => (double)(IngestedBytes + CompactionWrittenBytes) / IngestedBytes;

    public void Ingest(int records)
    {
        for (var i = 0; i < records; i++)
        {
            if (open is null)
            {
                open = NewSegment();
            }

            open.Live.Add(nextRecord++);
            open.Bytes += RecordBytes;
            IngestedBytes += RecordBytes;
            if (open.Bytes >= sealAtBytes)
            {
                Seal(open);
                open = null;
            }
        }
    }

    /// <summary>Kills <paramref name="share"/> of the live records at random and replaces them with new ones.</summary>
    public void ChurnRound(double share)
    {
        var live = segments.Values.SelectMany(s => s.Live.Select(r => (Segment: s, Record: r))).OrderBy(x => x.Record).ToList();
        var kill = (int)(live.Count * share);
        foreach (var (segment, record) in live.OrderBy(_ => random.Next()).Take(kill))
        {
            segment.Live.Remove(record);
        }

        Ingest(kill);
        now = now.AddHours(1);
    }

    public IReadOnlyList<CompactionJob> Compact()
    {
        var stats = segments.Values.Select(s => new SegmentStats(s.Id, "e", s.Sealed, s.Bytes, s.Live.Count * RecordBytes, s.Records, s.Live.Count, s.Created)).ToList();
        var jobs = CompactionPolicy.Plan(stats, options);
        foreach (var job in jobs)
        {
            var moving = job.SegmentIds.SelectMany(id => segments[id].Live).ToList();
            foreach (var id in job.SegmentIds)
            {
                segments.Remove(id);
            }

            Segment? output = null;
            foreach (var record in moving)
            {
                output ??= NewSegment();
                output.Live.Add(record);
                output.Bytes += RecordBytes;
                if (output.Bytes >= options.TargetSegmentBytes)
                {
                    Seal(output);
                    CompactionWrittenBytes += output.Bytes;
                    output = null;
                }
            }

            if (output is not null)
            {
                Seal(output);
                CompactionWrittenBytes += output.Bytes;
            }
        }

        return jobs;
    }

    private static void Seal(Segment segment)
    {
        segment.Sealed = true;
        segment.Bytes += 40;
    }

    private Segment NewSegment()
    {
        var segment = new Segment(nextSegmentId++, now) { Bytes = 112 };
        segments[segment.Id] = segment;
        return segment;
    }

    private sealed class Segment(long id, DateTimeOffset created)
    {
        public long Id { get; } = id;

        public DateTimeOffset Created { get; } = created;

        public bool Sealed { get; set; }

        public long Bytes { get; set; }

        public HashSet<long> Live { get; } = [];

        public long Records => (Bytes - 112) / RecordBytes;
    }
}
