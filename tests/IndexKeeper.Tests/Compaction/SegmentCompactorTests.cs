using IndexKeeper.Core.Compaction;
using IndexKeeper.Core.Storage;
using IndexKeeper.Tests.Storage;

namespace IndexKeeper.Tests.Compaction;

public sealed class SegmentCompactorTests
{
    private static readonly CompactionOptions Options = new();

    [Fact]
    public void Live_records_are_copied_byte_for_byte()
    {
        using var dir = new TempDirectory();
        var a = SegmentFileSetTests.Write(dir.Path, 1, [1, 2, 3, 4], seal: true);
        var b = SegmentFileSetTests.Write(dir.Path, 2, [6, 7, 8], seal: true);
        RecordLocation[] live = [b[2], a[1], a[3], b[0]];
        var nextId = 10L;
        var compactor = new SegmentCompactor(dir.Path, () => nextId++, Options);
        var job = new CompactionJob(TestVectors.EncoderId, [1, 2], CompactionReason.DeadShare, 0, 0);
        var result = compactor.Run(job, live);

        var output = Assert.Single(result.NewSegments);
        Assert.Equal(10, output.SegmentId);
        Assert.Equal(live.Sum(l => l.Length), result.BytesRead);
        Assert.Equal(new FileInfo(output.Path).Length, result.BytesWritten);
        Assert.Equal(live.Length, result.Moves.Count);
        var oldBytes = new[] { 1L, 2L }.ToDictionary(id => id, id => File.ReadAllBytes(SegmentFileNames.PathOf(dir.Path, id)));
        var newBytes = File.ReadAllBytes(output.Path);
        foreach (var (from, to) in result.Moves)
        {
            Assert.Equal((from.Length, from.Checksum, 10L), (to.Length, to.Checksum, to.SegmentId));
            Assert.Equal(oldBytes[from.SegmentId].AsSpan((int)from.Offset, from.Length).ToArray(), newBytes.AsSpan((int)to.Offset, to.Length).ToArray());
        }

        using var reader = SegmentReader.Open(output.Path);
        var scan = reader.Scan();
        Assert.Equal(SegmentEnd.Sealed, scan.End);

        // Job order, then offset order: segment 1's records first.
        Assert.Equal([TestVectors.Key(2), TestVectors.Key(4), TestVectors.Key(6), TestVectors.Key(8)], scan.Records.Select(r => r.Key));
        Assert.Empty(Directory.GetFiles(dir.Path, "*" + SegmentFileNames.TempSuffix));
    }

    [Fact]
    public void Outputs_are_sealed_at_the_target_size()
    {
        using var dir = new TempDirectory();
        var a = SegmentFileSetTests.Write(dir.Path, 1, [4, 9, 14, 19, 24], seal: true);
        var nextId = 10L;
        var options = new CompactionOptions { SmallSegmentBytes = 0, TargetSegmentBytes = 1_000 };
        var result = new SegmentCompactor(dir.Path, () => nextId++, options).Run(new CompactionJob(TestVectors.EncoderId, [1], CompactionReason.DeadShare, 0, 0), a);

        // Each record of 4 vectors is 664 bytes; with the 112-byte header the second crosses 1,000.
        Assert.Equal([2L, 2L, 1L], result.NewSegments.Select(s => s.RecordCount));
        Assert.Equal(5, result.Moves.Count);
        foreach (var segment in result.NewSegments)
        {
            using var reader = SegmentReader.Open(segment.Path);
            Assert.Equal(SegmentEnd.Sealed, reader.Scan().End);
        }
    }

    [Fact]
    public void A_damaged_record_fails_the_job_and_leaves_no_new_file()
    {
        using var dir = new TempDirectory();
        var a = SegmentFileSetTests.Write(dir.Path, 1, [1, 2, 3], seal: true);
        var path = SegmentFileNames.PathOf(dir.Path, 1);
        var bytes = File.ReadAllBytes(path);
        bytes[(int)a[2].Offset + 60] ^= 0x04;
        File.SetAttributes(path, FileAttributes.Normal);
        File.WriteAllBytes(path, bytes);
        var nextId = 10L;
        var options = new CompactionOptions { SmallSegmentBytes = 0, TargetSegmentBytes = 300 };
        var compactor = new SegmentCompactor(dir.Path, () => nextId++, options);
        var job = new CompactionJob(TestVectors.EncoderId, [1], CompactionReason.DeadShare, 0, 0);
        var error = Assert.Throws<SegmentFormatException>(() => compactor.Run(job, a));
        Assert.Equal(a[2].Offset, error.Offset);
        Assert.Equal([path], Directory.GetFiles(dir.Path));
    }

    [Fact]
    public void Cancellation_and_strays_leave_no_new_file()
    {
        using var dir = new TempDirectory();
        var a = SegmentFileSetTests.Write(dir.Path, 1, [1, 2], seal: true);
        var b = SegmentFileSetTests.Write(dir.Path, 2, [3], seal: true);
        var nextId = 10L;
        var compactor = new SegmentCompactor(dir.Path, () => nextId++, Options);
        var job = new CompactionJob(TestVectors.EncoderId, [1], CompactionReason.DeadShare, 0, 0);
        using var cancelled = new CancellationTokenSource();
        cancelled.Cancel();
        Assert.Throws<OperationCanceledException>(() => compactor.Run(job, a, cancelled.Token));
        Assert.Throws<ArgumentException>(() => compactor.Run(job, [.. a, .. b]));
        Assert.Throws<SegmentFormatException>(() => compactor.Run(job with { EncoderId = "another-encoder" }, a));
        Assert.Equal(2, Directory.GetFiles(dir.Path).Length);

        var drop = compactor.Run(job with { Reason = CompactionReason.Drop }, []);
        Assert.Empty(drop.NewSegments);
        Assert.Empty(drop.Moves);

        var done = compactor.Run(job, a);
        SegmentCompactor.Discard(done);
        Assert.Equal(2, Directory.GetFiles(dir.Path).Length);
    }

    [Fact]
    public async Task Readers_keep_reading_while_a_compaction_rewrites_and_releases()
    {
        using var dir = new TempDirectory();
        var seeds = Enumerable.Range(1, 24).ToArray();
        var old = SegmentFileSetTests.Write(dir.Path, 1, seeds, seal: true);
        var oldPath = SegmentFileNames.PathOf(dir.Path, 1);
        var expected = seeds.ToDictionary(TestVectors.Key, s => VectorQuantization.ToFloat16(TestVectors.Set(s, s % 5).Vectors));
        using var files = new SegmentFileSet(dir.Path);
        var before = files.OpenSource(TestVectors.EncoderId, old);
        using var stop = new CancellationTokenSource();
        var failures = 0;
        var reads = 0;

        void ReadUntilStopped(IVectorSetSource source)
        {
            while (!stop.IsCancellationRequested)
            {
                for (var i = 0; i < source.Count; i++)
                {
                    var stored = source.Get(i);
                    if (!stored.Vectors.SequenceEqual(expected[stored.Key]))
                    {
                        Interlocked.Increment(ref failures);
                    }

                    Interlocked.Increment(ref reads);
                }
            }
        }

        var oldReaders = Enumerable.Range(0, 2).Select(_ => Task.Run(() => ReadUntilStopped(before))).ToArray();

        // Half the vector sets die; the policy asks for a rewrite; the compactor copies the rest.
        var live = old.Where((_, i) => i % 2 == 0).ToList();
        var stats = new SegmentStats(1, TestVectors.EncoderId, true, new FileInfo(oldPath).Length, live.Sum(l => l.Length), old.Length, live.Count, DateTimeOffset.UnixEpoch);
        var job = Assert.Single(CompactionPolicy.Plan([stats], Options));
        var nextId = 2L;
        var result = new SegmentCompactor(dir.Path, () => nextId++, Options).Run(job, live);

        // The "catalog swap": new readers get the moved locations, then the old segment is retired.
        var after = files.OpenSource(TestVectors.EncoderId, [.. live.Select(l => result.Moves[l])]);
        var newReader = Task.Run(() => ReadUntilStopped(after));
        files.Retire(1);
        SpinWait.SpinUntil(() => Volatile.Read(ref reads) > 2_000, TimeSpan.FromSeconds(30));
        Assert.True(File.Exists(oldPath), "the old segment went while a reader held it");
        stop.Cancel();
        await Task.WhenAll([.. oldReaders, newReader]);
        before.Dispose();
        Assert.False(File.Exists(oldPath));
        Assert.Equal(0, failures);
        Assert.True(reads > 0);
        for (var i = 0; i < after.Count; i++)
        {
            Assert.Equal(TestVectors.Key(seeds[i * 2]), after.Get(i).Key);
        }

        after.Dispose();
    }
}
