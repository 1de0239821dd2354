using IndexKeeper.Core.Storage;

namespace IndexKeeper.Tests.Storage;

public sealed class SegmentFileSetTests
{
    private static readonly DateTimeOffset Start = new(2031, 3, 14, 8, 0, 0, TimeSpan.Zero);

    [Fact]
    public void A_source_hands_out_the_stored_vectors_in_location_order()
    {
        using var dir = new TempDirectory();
        var first = Write(dir.Path, 1, [10, 11, 12], seal: true);
        var second = Write(dir.Path, 2, [20, 21], seal: false);
        using var files = new SegmentFileSet(dir.Path);
        RecordLocation[] locations = [second[1], first[0], first[2], second[0]];
        using var source = files.OpenSource(TestVectors.EncoderId, locations);
        Assert.Equal(4, source.Count);
        Assert.Equal(64, source.Dimensions);
        int[] seeds = [21, 10, 12, 20];
        for (var i = 0; i < seeds.Length; i++)
        {
            var stored = source.Get(i);
            var expected = VectorQuantization.ToFloat16(TestVectors.Set(seeds[i], seeds[i] % 5).Vectors);
            Assert.Equal(TestVectors.Key(seeds[i]), stored.Key);
            Assert.True(stored.Vectors.SequenceEqual(expected));
            Assert.True(stored.SignCodes.SequenceEqual(VectorQuantization.SignCodes(expected, 64)));
            Assert.True(stored.Regions.SequenceEqual(TestVectors.Set(seeds[i], seeds[i] % 5).Regions));
        }
    }

    [Fact]
    public void Letting_go_of_resident_pages_leaves_an_open_source_reading_the_same_bytes()
    {
        using var dir = new TempDirectory();
        var locations = Write(dir.Path, 1, [30, 31, 32], seal: true);
        using var files = new SegmentFileSet(dir.Path);
        using var source = files.OpenSource(TestVectors.EncoderId, locations);
        var before = Enumerable.Range(0, source.Count).Select(i => source.Get(i).Vectors.ToArray()).ToList();
        files.DropResident();
        for (var i = 0; i < source.Count; i++)
        {
            // The map is read again from the file (madvise(2), MADV_DONTNEED on a shared file mapping), not zeroed.
            var expected = VectorQuantization.ToFloat16(TestVectors.Set(30 + i, (30 + i) % 5).Vectors);
            Assert.True(source.Get(i).Vectors.SequenceEqual(expected));
            Assert.True(source.Get(i).Vectors.SequenceEqual(before[i]));
            Assert.Equal(TestVectors.Key(30 + i), source.Get(i).Key);
        }
    }

    [Fact]
    public void A_retired_segment_is_deleted_when_its_last_reader_lets_go()
    {
        using var dir = new TempDirectory();
        var locations = Write(dir.Path, 1, [1, 2], seal: true);
        var path = SegmentFileNames.PathOf(dir.Path, 1);
        using var files = new SegmentFileSet(dir.Path);
        var first = files.OpenSource(TestVectors.EncoderId, locations);
        var second = files.OpenSource(TestVectors.EncoderId, locations[..1]);
        files.Retire(1);
        Assert.True(File.Exists(path));
        Assert.Equal(TestVectors.Key(2), first.Get(1).Key);
        Assert.Throws<InvalidOperationException>(() => files.OpenSource(TestVectors.EncoderId, locations));
        first.Dispose();
        Assert.True(File.Exists(path));
        Assert.Equal(TestVectors.Key(1), second.Get(0).Key);
        second.Dispose();
        Assert.False(File.Exists(path));
        Assert.Throws<ObjectDisposedException>(() => second.Get(0));
    }

    [Fact]
    public void A_segment_nobody_reads_is_deleted_at_once()
    {
        using var dir = new TempDirectory();
        Write(dir.Path, 1, [1], seal: true);
        using var files = new SegmentFileSet(dir.Path);
        files.Retire(1);
        Assert.False(File.Exists(SegmentFileNames.PathOf(dir.Path, 1)));
    }

    [Fact]
    public void A_growing_open_segment_is_mapped_again_and_older_sources_stay_valid()
    {
        using var dir = new TempDirectory();
        using var files = new SegmentFileSet(dir.Path);
        using var writer = SegmentWriter.Create(dir.Path, new SegmentHeader(3, TestVectors.EncoderId, 64, Start));
        var early = writer.Append(TestVectors.Key(1), TestVectors.Set(1, 1));
        writer.Flush(durable: true);
        using var before = files.OpenSource(TestVectors.EncoderId, [early]);
        var late = writer.Append(TestVectors.Key(2), TestVectors.Set(2, 2));
        writer.Flush(durable: true);
        using var after = files.OpenSource(TestVectors.EncoderId, [early, late]);
        Assert.Equal(TestVectors.Key(1), before.Get(0).Key);
        Assert.Equal(TestVectors.Key(2), after.Get(1).Key);
        Assert.Equal(2, after.Get(1).Count);
    }

    [Fact]
    public void Bad_locations_and_other_encoders_are_left_out_and_named()
    {
        using var dir = new TempDirectory();
        var locations = Write(dir.Path, 1, [1, 2], seal: true);
        using var files = new SegmentFileSet(dir.Path);
        AssertUnreadable(files.OpenSource("another-encoder", locations), [0, 1], "encoder");
        AssertUnreadable(files.OpenSource(TestVectors.EncoderId, [locations[0] with { Checksum = 0 }]), [0], "not the one the location names");
        AssertUnreadable(files.OpenSource(TestVectors.EncoderId, [locations[0] with { Offset = locations[0].Offset + 8 }]), [0], null);
        AssertUnreadable(files.OpenSource(TestVectors.EncoderId, [locations[1] with { Offset = locations[1].Offset + 4096 }]), [0], "the file has");
        AssertUnreadable(files.OpenSource(TestVectors.EncoderId, [locations[0], locations[1] with { SegmentId = 9 }]), [1], "is missing", readable: 1);

        // A left-out segment is held by nothing: retiring still deletes at once.
        files.Retire(1);
        Assert.False(File.Exists(SegmentFileNames.PathOf(dir.Path, 1)));
    }

    [Fact]
    public void A_damaged_record_costs_that_record_only()
    {
        using var dir = new TempDirectory();
        var locations = Write(dir.Path, 1, [1, 2, 3], seal: false);
        var path = SegmentFileNames.PathOf(dir.Path, 1);
        var bytes = File.ReadAllBytes(path);
        bytes[(int)locations[1].Offset + 100] ^= 0x40;
        File.WriteAllBytes(path, bytes);
        using var files = new SegmentFileSet(dir.Path);
        using (var first = files.OpenSource(TestVectors.EncoderId, [locations[0]]))
        {
            Assert.Empty(first.Unreadable);
        }

        // Damage after the first check is still caught for a location not checked before.
        using var source = files.OpenSource(TestVectors.EncoderId, locations);
        var bad = Assert.Single(source.Unreadable);
        Assert.Equal(1, bad.Index);
        Assert.Contains(locations[1].Offset.ToString(System.Globalization.CultureInfo.InvariantCulture), bad.Problem, StringComparison.Ordinal);
        Assert.Equal(2, source.Count);
        Assert.Equal(TestVectors.Key(1), source.Get(0).Key);
        Assert.Equal(TestVectors.Key(3), source.Get(1).Key);
    }

    private static void AssertUnreadable(SegmentVectorSetSource source, int[] indexes, string? problem, int readable = 0)
    {
        using (source)
        {
            Assert.Equal(indexes, source.Unreadable.Select(u => u.Index));
            Assert.Equal(readable, source.Count);
            if (problem is not null)
            {
                Assert.All(source.Unreadable, u => Assert.Contains(problem, u.Problem, StringComparison.Ordinal));
            }
        }
    }

    /// <summary>Writes one segment whose record for seed s holds s % 5 vectors, key Key(s).</summary>
    internal static RecordLocation[] Write(string directory, long segmentId, int[] seeds, bool seal)
    {
        using var writer = SegmentWriter.Create(directory, new SegmentHeader(segmentId, TestVectors.EncoderId, 64, Start));
        var locations = seeds.Select(s => writer.Append(TestVectors.Key(s), TestVectors.Set(s, s % 5))).ToArray();
        if (seal)
        {
            writer.Seal();
        }
        else
        {
            writer.Flush(durable: true);
        }

        return locations;
    }
}
