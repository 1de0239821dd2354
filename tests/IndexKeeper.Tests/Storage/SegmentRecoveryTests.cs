using System.Buffers.Binary;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Tests.Storage;

/// <summary>Torn tails, damaged bytes and unknown versions: what a crash or a bad disk leaves behind.</summary>
public sealed class SegmentRecoveryTests
{
    private static readonly DateTimeOffset Start = new(2031, 3, 14, 8, 0, 0, TimeSpan.Zero);

    [Fact]
    public void A_cut_anywhere_in_the_last_record_is_a_torn_tail_that_reopen_cuts_away()
    {
        using var dir = new TempDirectory();
        var (bytes, locations) = WriteSegment(dir.Path, seal: false);
        var last = locations[^1];
        var path = SegmentFileNames.PathOf(dir.Path, 1);
        for (var cut = (int)last.Offset; cut < last.Offset + last.Length; cut++)
        {
            File.Delete(path);
            File.WriteAllBytes(path, bytes.AsSpan(0, cut).ToArray());
            using (var reader = SegmentReader.Open(path))
            {
                var scan = reader.Scan();
                Assert.Equal(cut == last.Offset ? SegmentEnd.Open : SegmentEnd.TornTail, scan.End);
                Assert.Equal(last.Offset, scan.ValidLength);
                Assert.Equal(locations[..^1], scan.Records.Select(r => r.Location));
            }

            using (var writer = SegmentWriter.Reopen(path))
            {
                Assert.Equal(last.Offset, writer.Length);
                Assert.Equal(last, writer.Append(TestVectors.Key(2), TestVectors.Set(2, 1)));
            }

            Assert.Equal(bytes, File.ReadAllBytes(path));
        }
    }

    [Fact]
    public void A_cut_inside_the_seal_leaves_an_open_segment_with_every_record()
    {
        using var dir = new TempDirectory();
        var (bytes, locations) = WriteSegment(dir.Path, seal: true);
        var path = SegmentFileNames.PathOf(dir.Path, 1);
        var sealOffset = locations[^1].Offset + locations[^1].Length;
        for (var cut = (int)sealOffset + 1; cut < bytes.Length; cut++)
        {
            File.SetAttributes(path, FileAttributes.Normal);
            File.Delete(path);
            File.WriteAllBytes(path, bytes.AsSpan(0, cut).ToArray());
            using var reader = SegmentReader.Open(path);
            Assert.False(reader.IsSealed);
            var scan = reader.Scan();
            Assert.Equal(SegmentEnd.TornTail, scan.End);
            Assert.Equal(sealOffset, scan.ValidLength);
            Assert.Equal(locations, scan.Records.Select(r => r.Location));
        }
    }

    [Fact]
    public void A_tail_of_never_written_zeros_is_torn_not_damaged()
    {
        using var dir = new TempDirectory();
        var (bytes, _) = WriteSegment(dir.Path, seal: false);
        var path = SegmentFileNames.PathOf(dir.Path, 1);
        File.WriteAllBytes(path, [.. bytes, .. new byte[4096]]);
        using var reader = SegmentReader.Open(path);
        var scan = reader.Scan();
        Assert.Equal(SegmentEnd.TornTail, scan.End);
        Assert.Equal(bytes.Length, scan.ValidLength);
    }

    [Fact]
    public void A_flipped_bit_anywhere_is_reported_never_read_as_data()
    {
        using var dir = new TempDirectory();
        var (bytes, locations) = WriteSegment(dir.Path, seal: true);
        var path = SegmentFileNames.PathOf(dir.Path, 1);
        for (var at = 0; at < bytes.Length; at++)
        {
            // One bit per byte, low and high in turn, so every field sees a small and a large change.
            var bit = at % 2 == 0 ? 0x01 : 0x80;
            var damaged = bytes.ToArray();
            damaged[at] ^= (byte)bit;
            File.SetAttributes(path, FileAttributes.Normal);
            File.WriteAllBytes(path, damaged);
            if (at < locations[0].Offset)
            {
                Assert.Throws<SegmentFormatException>(() => SegmentReader.Open(path));
                continue;
            }

            using var reader = SegmentReader.Open(path);
            var scan = reader.Scan();
            Assert.True(scan.End == SegmentEnd.Damaged, $"byte {at} bit {bit}: scan ended {scan.End}");
            Assert.NotNull(scan.Problem);
            foreach (var location in locations)
            {
                var inside = at >= location.Offset && at < location.Offset + location.Length;
                if (inside)
                {
                    Assert.Equal(location.Offset, scan.DamageOffset);
                    var error = Assert.Throws<SegmentFormatException>(() => reader.Read(location));
                    Assert.Equal(location.Offset, error.Offset);
                }
                else
                {
                    Assert.Equal(TestVectors.Key(Array.IndexOf(locations, location)), reader.Read(location).Key);
                }
            }

            // Damage stays local for the catalog rebuild too: the walk resynchronises past the bad bytes and
            // finds every other record, none twice and none invented.
            var undamaged = locations.Where(l => at < l.Offset || at >= l.Offset + l.Length);
            Assert.Equal(undamaged, scan.Records.Concat(scan.RecordsAfterDamage).Select(r => r.Location));
        }
    }

    [Fact]
    public void An_unsealed_segment_with_a_bad_record_is_sealed_as_it_is()
    {
        using var dir = new TempDirectory();
        var (bytes, locations) = WriteSegment(dir.Path, seal: false);
        var path = SegmentFileNames.PathOf(dir.Path, 1);
        bytes[locations[1].Offset + 20] ^= 0x04;
        File.WriteAllBytes(path, bytes);
        Assert.Null(SegmentResealer.SealAfterDamage(path));

        using var reader = SegmentReader.Open(path);
        Assert.True(reader.IsSealed);
        Assert.Null(reader.SealProblem());
        Assert.Equal(bytes, File.ReadAllBytes(path).AsSpan(0, bytes.Length).ToArray());
        Assert.Equal(locations[0], Assert.Single(reader.Scan().Records).Location);
        Assert.Equal(locations[2], Assert.Single(reader.Scan().RecordsAfterDamage).Location);
        Assert.NotNull(SegmentResealer.SealAfterDamage(path));
    }

    [Fact]
    public void An_unknown_version_is_an_error_naming_it()
    {
        using var dir = new TempDirectory();
        var (bytes, _) = WriteSegment(dir.Path, seal: false);
        var path = SegmentFileNames.PathOf(dir.Path, 1);
        BinaryPrimitives.WriteUInt32LittleEndian(bytes.AsSpan(8), 2);
        File.WriteAllBytes(path, bytes);
        var error = Assert.Throws<SegmentFormatException>(() => SegmentReader.Open(path));
        Assert.Contains("unknown segment format version 2", error.Message, StringComparison.Ordinal);
        Assert.Throws<SegmentFormatException>(() => SegmentWriter.Reopen(path));
    }

    [Fact]
    public void Not_a_segment_and_a_truncated_header_are_errors()
    {
        using var dir = new TempDirectory();
        var path = Path.Combine(dir.Path, "seg-000001.vec");
        File.WriteAllBytes(path, "%PDF-1.7\nnot a segment at all, but long enough to hold a header\n"u8.ToArray());
        Assert.Contains("wrong magic", Assert.Throws<SegmentFormatException>(() => SegmentReader.Open(path)).Message, StringComparison.Ordinal);
        File.WriteAllBytes(path, "IKVSEG\r\n"u8.ToArray());
        Assert.Contains("truncated header", Assert.Throws<SegmentFormatException>(() => SegmentReader.Open(path)).Message, StringComparison.Ordinal);
        File.WriteAllBytes(path, []);
        Assert.Throws<SegmentFormatException>(() => SegmentReader.Open(path));
    }

    [Fact]
    public void A_location_that_does_not_match_the_record_is_refused()
    {
        using var dir = new TempDirectory();
        var (_, locations) = WriteSegment(dir.Path, seal: true);
        using var reader = SegmentReader.Open(SegmentFileNames.PathOf(dir.Path, 1));
        var good = locations[1];
        Assert.Throws<SegmentFormatException>(() => reader.Read(good with { Checksum = good.Checksum ^ 1 }));
        Assert.Throws<SegmentFormatException>(() => reader.Read(good with { Length = good.Length - 8 }));
        Assert.Throws<SegmentFormatException>(() => reader.Read(good with { Offset = good.Offset + 8 }));
        Assert.Throws<SegmentFormatException>(() => reader.Read(good with { Offset = reader.Length }));
        Assert.Throws<ArgumentException>(() => reader.Read(good with { SegmentId = 2 }));
    }

    /// <summary>Segment 1 with three small records (one 64-d vector each).</summary>
    private static (byte[] Bytes, RecordLocation[] Locations) WriteSegment(string directory, bool seal)
    {
        var locations = new RecordLocation[3];
        string path;
        using (var writer = SegmentWriter.Create(directory, new SegmentHeader(1, TestVectors.EncoderId, 64, Start)))
        {
            path = writer.Path;
            for (var i = 0; i < locations.Length; i++)
            {
                locations[i] = writer.Append(TestVectors.Key(i), TestVectors.Set(i, 1));
            }

            if (seal)
            {
                writer.Seal();
            }
        }

        return (File.ReadAllBytes(path), locations);
    }
}
