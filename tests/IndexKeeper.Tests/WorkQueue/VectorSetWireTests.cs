using System.Buffers.Binary;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Storage;
using IndexKeeper.Service.WorkQueue;

namespace IndexKeeper.Tests.WorkQueue;

/// <summary>The result bytes of docs/work-queue.md (version 2, float16 rows): exact round trip, and every damage refused.</summary>
public sealed class VectorSetWireTests
{
    private static VectorSet Sample()
    {
        var random = new Random(11);
        var vectors = Enumerable.Range(0, 3 * 64).Select(_ => (float)(random.NextDouble() - 0.5)).ToArray();
        for (var row = 0; row < 3; row++)
        {
            var span = vectors.AsSpan(row * 64, 64);
            var norm = MathF.Sqrt(System.Numerics.Tensors.TensorPrimitives.SumOfSquares<float>(span));
            System.Numerics.Tensors.TensorPrimitives.Divide(span, norm, span);
        }

        var regions = Enumerable.Range(0, 3).Select(i => new PageBox(i, i + 0.5f, i + 10.25f, i + 20.125f)).ToArray();
        return new VectorSet(64, vectors, regions);
    }

    [Fact]
    public void Round_trip_gives_the_float16_a_local_batch_stores()
    {
        var set = Sample();
        var back = VectorSetWire.Read(VectorSetWire.Write(set));
        Assert.Equal(set.Dimensions, back.Dimensions);

        // Each value rounded to IEEE 754-2008 binary16, nearest even, as System.Half's explicit conversion does.
        Assert.Equal(set.Vectors.Select(v => (Half)v), back.Vectors);
        Assert.Equal(VectorQuantization.ToFloat16(set.Vectors), back.Vectors);
        Assert.Equal(set.Regions, back.Regions);
    }

    [Fact]
    public void Layout_is_the_documented_one()
    {
        var unit = new float[64];
        unit[0] = 1f;
        var bytes = VectorSetWire.Write(new VectorSet(64, unit, [new PageBox(1, 2, 3, 4)]));
        Assert.Equal("IKVW"u8.ToArray(), bytes[..4]);
        Assert.Equal(2, BinaryPrimitives.ReadUInt16LittleEndian(bytes.AsSpan(4)));
        Assert.Equal(VectorSetWire.Version, BinaryPrimitives.ReadUInt16LittleEndian(bytes.AsSpan(4)));
        Assert.Equal(16 + (64 * 2) + 16 + 4, bytes.Length);

        // 1.0 in binary16 is 0x3C00 (IEEE 754-2008 §3.6: exponent bias 15, 5 exponent bits), stored little-endian.
        Assert.Equal(new byte[] { 0x00, 0x3C }, bytes[16..18]);
        Assert.Equal(1f, BinaryPrimitives.ReadSingleLittleEndian(bytes.AsSpan(16 + 128)));

        // The trailer is CRC-32C (RFC 3720) of everything before it, little-endian.
        Assert.Equal(Crc32C.Compute(bytes.AsSpan(0, bytes.Length - 4)), BinaryPrimitives.ReadUInt32LittleEndian(bytes.AsSpan(bytes.Length - 4)));
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

    [Fact]
    public void Version_1_bytes_are_refused_by_name()
    {
        var bytes = VectorSetWire.Write(Sample());
        BinaryPrimitives.WriteUInt16LittleEndian(bytes.AsSpan(4), 1);
        Reseal(bytes);
        var refused = Assert.Throws<FormatException>(() => VectorSetWire.Read(bytes));
        Assert.Contains("version 1", refused.Message, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData(0x7E00)] // a binary16 NaN (IEEE 754-2008 §3.4: all-ones exponent, non-zero fraction)
    [InlineData(0x7C00)] // +infinity
    [InlineData(0x4400)] // 4.0: a row longer than a unit row
    public void Rows_no_encoder_makes_are_refused_even_with_a_good_checksum(int pattern)
    {
        var bytes = VectorSetWire.Write(Sample());
        BinaryPrimitives.WriteUInt16LittleEndian(bytes.AsSpan(16 + (64 * 2) + 6), (ushort)pattern);
        Reseal(bytes);
        Assert.Throws<FormatException>(() => VectorSetWire.Read(bytes));
    }

    private static void Reseal(byte[] bytes) =>
        BinaryPrimitives.WriteUInt32LittleEndian(bytes.AsSpan(bytes.Length - 4), Crc32C.Compute(bytes.AsSpan(0, bytes.Length - 4)));
}
