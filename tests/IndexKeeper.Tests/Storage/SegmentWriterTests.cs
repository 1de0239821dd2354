using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Tests.Storage;

public sealed class SegmentWriterTests
{
    private static readonly DateTimeOffset Start = new(2031, 3, 14, 8, 0, 0, TimeSpan.Zero);

    [Fact]
    public void Records_read_back_as_written()
    {
        using var dir = new TempDirectory();
        var header = new SegmentHeader(7, TestVectors.EncoderId, 128, Start);
        var sets = new[] { TestVectors.Set(1, 5, 128), TestVectors.Set(2, 0, 128), TestVectors.Set(3, 33, 128) };
        var locations = new List<RecordLocation>();
        using (var writer = SegmentWriter.Create(dir.Path, header))
        {
            for (var i = 0; i < sets.Length; i++)
            {
                locations.Add(writer.Append(TestVectors.Key(i), sets[i]));
            }

            writer.Flush(durable: true);
            Assert.Equal(3, writer.RecordCount);
            Assert.Equal(new FileInfo(writer.Path).Length, writer.Length);
        }

        using var reader = SegmentReader.Open(SegmentFileNames.PathOf(dir.Path, 7));
        Assert.Equal(header, reader.Header);
        Assert.False(reader.IsSealed);
        for (var i = 0; i < sets.Length; i++)
        {
            var stored = reader.Read(locations[i]);
            var halves = VectorQuantization.ToFloat16(sets[i].Vectors);
            Assert.Equal(TestVectors.Key(i), stored.Key);
            Assert.Equal(sets[i].Count, stored.Count);
            Assert.Equal(128, stored.Dimensions);
            Assert.True(stored.Vectors.SequenceEqual(halves));
            Assert.True(stored.SignCodes.SequenceEqual(VectorQuantization.SignCodes(halves, 128)));
            Assert.True(stored.Regions.SequenceEqual(sets[i].Regions));
        }

        var scan = reader.Scan();
        Assert.Equal(SegmentEnd.Open, scan.End);
        Assert.Equal(reader.Length, scan.ValidLength);
        Assert.Equal(locations, scan.Records.Select(r => r.Location));
        Assert.Equal([5, 0, 33], scan.Records.Select(r => r.VectorCount));
    }

    [Fact]
    public void Seal_makes_the_segment_immutable_and_verifiable()
    {
        using var dir = new TempDirectory();
        SealedSegment sealedSegment;
        using (var writer = SegmentWriter.Create(dir.Path, new SegmentHeader(3, TestVectors.EncoderId, 64, Start)))
        {
            writer.Append(TestVectors.Key(1), TestVectors.Set(1, 4));
            writer.Append(TestVectors.Key(2), TestVectors.Set(2, 6));
            sealedSegment = writer.Seal();
            Assert.Throws<InvalidOperationException>(() => writer.Append(TestVectors.Key(3), TestVectors.Set(3, 1)));
        }

        Assert.Equal(2, sealedSegment.RecordCount);
        Assert.Equal(new FileInfo(sealedSegment.Path).Length, sealedSegment.Length);
        if (!OperatingSystem.IsWindows())
        {
            Assert.Equal(UnixFileMode.None, File.GetUnixFileMode(sealedSegment.Path) & (UnixFileMode.UserWrite | UnixFileMode.GroupWrite | UnixFileMode.OtherWrite));
        }

        using (var reader = SegmentReader.Open(sealedSegment.Path))
        {
            Assert.True(reader.IsSealed);
            var scan = reader.Scan();
            Assert.Equal(SegmentEnd.Sealed, scan.End);
            Assert.Equal(sealedSegment.Length, scan.ValidLength);
            Assert.Equal(2, scan.Records.Count);
            Assert.Equal(sealedSegment.FileChecksum, Crc32C.Compute(File.ReadAllBytes(sealedSegment.Path).AsSpan(0, (int)sealedSegment.Length - 40)));
        }

        Assert.Throws<InvalidOperationException>(() => SegmentWriter.Reopen(sealedSegment.Path));
    }

    [Fact]
    public void Reopen_continues_an_open_segment()
    {
        using var dir = new TempDirectory();
        string path;
        using (var writer = SegmentWriter.Create(dir.Path, new SegmentHeader(4, TestVectors.EncoderId, 64, Start)))
        {
            path = writer.Path;
            writer.Append(TestVectors.Key(1), TestVectors.Set(1, 3));
            writer.Append(TestVectors.Key(2), TestVectors.Set(2, 3));
            writer.Flush(durable: true);
        }

        using (var writer = SegmentWriter.Reopen(path))
        {
            Assert.Equal(2, writer.RecordCount);
            writer.Append(TestVectors.Key(3), TestVectors.Set(3, 2));
            writer.Seal();
        }

        using var reader = SegmentReader.Open(path);
        var scan = reader.Scan();
        Assert.Equal(SegmentEnd.Sealed, scan.End);
        Assert.Equal([TestVectors.Key(1), TestVectors.Key(2), TestVectors.Key(3)], scan.Records.Select(r => r.Key));
    }

    [Fact]
    public void Should_seal_at_the_size_or_the_age_limit()
    {
        using var dir = new TempDirectory();
        var clock = new ManualTimeProvider(Start);
        var options = new SegmentWriterOptions { SealAtBytes = 65536, SealAtAge = TimeSpan.FromMinutes(30) };
        using (var bySize = SegmentWriter.Create(dir.Path, new SegmentHeader(1, TestVectors.EncoderId, 64, Start), options, clock))
        {
            var appended = 0;
            while (!bySize.ShouldSeal)
            {
                bySize.Append(TestVectors.Key(appended), TestVectors.Set(appended, 40));
                appended++;
            }

            // 40 vectors of 64-d make a 6,136-byte record: the 11th crosses 65,536.
            Assert.Equal(11, appended);
        }

        using var byAge = SegmentWriter.Create(dir.Path, new SegmentHeader(2, TestVectors.EncoderId, 64, Start), options, clock);
        clock.Now = Start.AddMinutes(29);
        Assert.False(byAge.ShouldSeal);
        clock.Now = Start.AddMinutes(30);
        Assert.True(byAge.ShouldSeal);
    }

    [Fact]
    public void Temporary_segments_get_their_name_only_when_sealed()
    {
        using var dir = new TempDirectory();
        using (var abandoned = SegmentWriter.CreateTemporary(dir.Path, new SegmentHeader(5, TestVectors.EncoderId, 64, Start)))
        {
            abandoned.Append(TestVectors.Key(1), TestVectors.Set(1, 2));
            Assert.True(File.Exists(SegmentFileNames.TempPathOf(dir.Path, 5)));
        }

        Assert.Empty(Directory.GetFiles(dir.Path));
        using (var kept = SegmentWriter.CreateTemporary(dir.Path, new SegmentHeader(6, TestVectors.EncoderId, 64, Start)))
        {
            kept.Append(TestVectors.Key(1), TestVectors.Set(1, 2));
            Assert.Equal(SegmentFileNames.PathOf(dir.Path, 6), kept.Seal().Path);
        }

        Assert.Equal([SegmentFileNames.Name(6)], Directory.GetFiles(dir.Path).Select(Path.GetFileName));
    }

    [Fact]
    public void Bad_input_is_refused()
    {
        using var dir = new TempDirectory();
        using var writer = SegmentWriter.Create(dir.Path, new SegmentHeader(8, TestVectors.EncoderId, 64, Start));
        Assert.Throws<IOException>(() => SegmentWriter.Create(dir.Path, new SegmentHeader(8, TestVectors.EncoderId, 64, Start)));
        Assert.Throws<ArgumentException>(() => writer.Append(TestVectors.Key(1), TestVectors.Set(1, 2, 128)));
        Assert.Throws<ArgumentException>(() => writer.Append(TestVectors.Key(1), new Half[64], new PageBox[2]));
        Assert.Throws<ArgumentOutOfRangeException>(() => SegmentWriter.Create(dir.Path, new SegmentHeader(9, TestVectors.EncoderId, 96, Start)));
        var problems = new SegmentWriterOptions { SealAtBytes = 10, SealAtAge = TimeSpan.Zero, WriteBufferBytes = 1 }.Validate();
        Assert.Equal(3, problems.Count);
        Assert.Contains(problems, p => p.Contains(nameof(SegmentWriterOptions.SealAtAge), StringComparison.Ordinal));
    }
}
