using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Storage;
using IndexKeeper.Service.WorkQueue;

namespace IndexKeeper.Tests.WorkQueue;

/// <summary>The result bytes of docs/work-queue.md: exact round trip, and every damage refused.</summary>
public sealed class VectorSetWireTests
{
    private static VectorSet Sample()
    {
        var random = new Random(11);
        var vectors = Enumerable.Range(0, 3 * 64).Select(_ => (float)(random.NextDouble() - 0.5)).ToArray();
        var regions = Enumerable.Range(0, 3).Select(i => new PageBox(i, i + 0.5f, i + 10.25f, i + 20.125f)).ToArray();
        return new VectorSet(64, vectors, regions);
    }

    [Fact]
    public void Round_trip_is_bit_exact()
    {
        var set = Sample();
        var back = VectorSetWire.Read(VectorSetWire.Write(set));
        Assert.Equal(set.Dimensions, back.Dimensions);
        Assert.Equal(set.Vectors, back.Vectors);
        Assert.Equal(set.Regions, back.Regions);
    }

    [Fact]
    public void Layout_is_the_documented_one()
    {
        var bytes = VectorSetWire.Write(Sample());
        Assert.Equal("IKVW"u8.ToArray(), bytes[..4]);
        Assert.Equal(VectorSetWire.Version, BitConverter.ToUInt16(bytes, 4));
        Assert.Equal(16 + (3 * (64 + 4) * 4) + 4, bytes.Length);

        // The trailer is CRC-32C (RFC 3720) of everything before it, little-endian.
        Assert.Equal(Crc32C.Compute(bytes.AsSpan(0, bytes.Length - 4)), BitConverter.ToUInt32(bytes, bytes.Length - 4));
    }

    [Theory]
    [InlineData(0)]
    [InlineData(5)]
    [InlineData(9)]
    [InlineData(100)]
    public void A_flipped_byte_is_refused(int at)
    {
        var bytes = VectorSetWire.Write(Sample());
        bytes[at] ^= 0x40;
        Assert.Throws<FormatException>(() => VectorSetWire.Read(bytes));
    }

    [Fact]
    public void A_cut_tail_is_refused()
    {
        var bytes = VectorSetWire.Write(Sample());
        Assert.Throws<FormatException>(() => VectorSetWire.Read(bytes.AsSpan(0, bytes.Length - 7)));
    }
}
