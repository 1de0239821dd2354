using IndexKeeper.Core.Storage;
using IndexKeeper.Tests.Crash;

namespace IndexKeeper.Tests.Safety;

/// <summary>
/// Damage stays local (docs/recovery.md): every record of a segment carries its own CRC-32C (RFC 3720 §B.4,
/// docs/segment-format.md), so a record that fails it costs that one vector set, and a closing record that
/// fails its own leaves every record it closes in service.
/// </summary>
public sealed class LocalDamageTests
{
    [Fact]
    public void One_flipped_bit_costs_one_vector_set_not_the_segment()
    {
        using var directory = new Support.TempDirectory();
        var path = SealedIndex(directory.Path);
        using (var index = new OpenIndex(directory.Path))
        {
            var victim = index.Catalog.VectorSets.Live(OpenIndex.Encoder.Id)[3];
            FlipBit(path, victim.Offset + 60);

            var report = index.Verify();

            Assert.False(report.Clean);
            Assert.Contains(report.Problems, p => p.Contains(victim.PageKey, StringComparison.Ordinal));
            Assert.Equal(["segment 1: 1 damaged vector set(s) forgotten, 1 page(s) queued again; its other 7 read back and are kept"], report.Repairs);
            Assert.True(File.Exists(path));
            Assert.Equal(7, index.Readable().Count);
            Assert.DoesNotContain(victim.PageKey, index.Readable());
            Assert.Equal(1, index.Catalog.Figures().Queued);
        }
    }

    [Fact]
    public void A_bad_closing_record_loses_nothing()
    {
        using var directory = new Support.TempDirectory();
        var path = SealedIndex(directory.Path);

        // The seal is the last 40 bytes; its file-crc sits 8 bytes before the end (docs/segment-format.md, "seal").
        FlipBit(path, new FileInfo(path).Length - 8);
        using var index = new OpenIndex(directory.Path);

        var report = index.Verify();

        Assert.False(report.Clean);
        Assert.Contains(report.Problems, p => p.StartsWith("segment 1: it ends", StringComparison.Ordinal));
        Assert.DoesNotContain(report.Repairs, r => !r.StartsWith("at open:", StringComparison.Ordinal));
        Assert.True(File.Exists(path));
        Assert.Equal(8, index.Readable().Count);
        Assert.Equal(0, index.Catalog.Figures().Queued);
    }

    /// <summary>Eight pages with vectors in one sealed segment; returns the segment's path.</summary>
    private static string SealedIndex(string directory)
    {
        using var index = new OpenIndex(directory);
        index.Add(Enumerable.Range(0, 8));
        index.Commit(Enumerable.Range(0, 8));
        index.Store.SealAll();
        return SegmentFileNames.PathOf(index.Store.Directory, Assert.Single(index.Catalog.Segments.All()).Id);
    }

    private static void FlipBit(string path, long offset)
    {
        File.SetAttributes(path, File.GetAttributes(path) & ~FileAttributes.ReadOnly);
        using var file = new FileStream(path, FileMode.Open, FileAccess.ReadWrite);
        file.Position = offset;
        var value = file.ReadByte();
        file.Position = offset;
        file.WriteByte((byte)(value ^ 0x10));
    }
}
