using System.Buffers;
using System.Buffers.Binary;
using System.Numerics.Tensors;
using System.Runtime.InteropServices;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Service.WorkQueue;

/// <summary>
/// A vector set as a worker hands it back in <c>jobs.result_float16</c> (docs/work-queue.md, "Result bytes",
/// whose version matches <see cref="Version"/>): the rows already in the segments' float16
/// (<see cref="VectorQuantization.ToFloat16(ReadOnlySpan{float})"/>, as a local batch converts them) and the
/// region boxes, so the coordinator reads half the bytes of float32 and appends them without converting.
/// The reader checks the magic, the version, the sizes and the CRC-32C before it trusts a byte, and that
/// every row is finite and no longer than a unit row (the encoders' rows are L2-normalised).
/// </summary>
internal static class VectorSetWire
{
    /// <summary>Layout version. Never reuse a number (1: float32 rows, no longer read).</summary>
    public const ushort Version = 2;

    private const int HeaderBytes = 16;
    private const int ChecksumBytes = 4;
    private const int RegionBytes = 4 * sizeof(float);

    // A unit row's squared norm after rounding each component to float16 (relative error ≤ 2^-11 each,
    // IEEE 754-2008 binary16) stays well inside this; random or misplaced bytes do not.
    private const float MaxSquaredNorm = 1.01f;

    // "IKVW", never change.
    private static ReadOnlySpan<byte> Magic => "IKVW"u8;

    public static byte[] Write(VectorSet vectors)
    {
        ArgumentNullException.ThrowIfNull(vectors);
        var values = vectors.Vectors.Length;
        var bytes = new byte[HeaderBytes + (values * 2) + (vectors.Count * RegionBytes) + ChecksumBytes];
        var span = bytes.AsSpan();
        Magic.CopyTo(span);
        BinaryPrimitives.WriteUInt16LittleEndian(span[4..], Version);
        BinaryPrimitives.WriteInt32LittleEndian(span[8..], vectors.Dimensions);
        BinaryPrimitives.WriteInt32LittleEndian(span[12..], vectors.Count);
        var rows = span.Slice(HeaderBytes, values * 2);
        if (BitConverter.IsLittleEndian)
        {
            VectorQuantization.ToFloat16(vectors.Vectors, MemoryMarshal.Cast<byte, Half>(rows));
        }
        else
        {
            var halves = VectorQuantization.ToFloat16(vectors.Vectors);
            for (var i = 0; i < halves.Length; i++)
            {
                BinaryPrimitives.WriteHalfLittleEndian(rows[(i * 2)..], halves[i]);
            }
        }

        var at = HeaderBytes + (values * 2);
        foreach (var region in vectors.Regions)
        {
            foreach (var value in (ReadOnlySpan<float>)[region.Left, region.Bottom, region.Right, region.Top])
            {
                BinaryPrimitives.WriteSingleLittleEndian(span[at..], value);
                at += sizeof(float);
            }
        }

        BinaryPrimitives.WriteUInt32LittleEndian(span[at..], Crc32C.Compute(span[..at]));
        return bytes;
    }

    /// <summary>The vector set, or a <see cref="FormatException"/> saying what is wrong with the bytes.</summary>
    public static Float16VectorSet Read(ReadOnlySpan<byte> bytes)
    {
        if (bytes.Length < HeaderBytes + ChecksumBytes || !bytes[..4].SequenceEqual(Magic))
        {
            throw new FormatException("not a vector set of the work queue (magic)");
        }

        var version = BinaryPrimitives.ReadUInt16LittleEndian(bytes[4..]);
        if (version != Version)
        {
            throw new FormatException($"vector set bytes of version {version}; this build reads version {Version} only (a worker of another build wrote them: run the same version on every machine)");
        }

        var body = bytes.Length - ChecksumBytes;
        if (BinaryPrimitives.ReadUInt32LittleEndian(bytes[body..]) != Crc32C.Compute(bytes[..body]))
        {
            throw new FormatException("vector set bytes fail their CRC-32C");
        }

        var dimensions = BinaryPrimitives.ReadInt32LittleEndian(bytes[8..]);
        var count = BinaryPrimitives.ReadInt32LittleEndian(bytes[12..]);
        if (dimensions <= 0 || count < 0 || ((long)count * ((dimensions * 2L) + RegionBytes)) != body - HeaderBytes)
        {
            throw new FormatException($"vector set bytes of {body - HeaderBytes} for {count} rows of {dimensions}");
        }

        // One copy of the rows, straight from the bytes where the machine is little-endian (as the format).
        var values = count * dimensions;
        var rowBytes = bytes.Slice(HeaderBytes, values * 2);
        var rows = new Half[values];
        if (BitConverter.IsLittleEndian)
        {
            rowBytes.CopyTo(MemoryMarshal.AsBytes(rows.AsSpan()));
        }
        else
        {
            for (var i = 0; i < values; i++)
            {
                rows[i] = BinaryPrimitives.ReadHalfLittleEndian(rowBytes[(i * 2)..]);
            }
        }

        CheckRows(rows, dimensions);
        var at = HeaderBytes + (values * 2);
        var regions = new PageBox[count];
        for (var i = 0; i < count; i++, at += RegionBytes)
        {
            regions[i] = new PageBox(
                BinaryPrimitives.ReadSingleLittleEndian(bytes[at..]),
                BinaryPrimitives.ReadSingleLittleEndian(bytes[(at + 4)..]),
                BinaryPrimitives.ReadSingleLittleEndian(bytes[(at + 8)..]),
                BinaryPrimitives.ReadSingleLittleEndian(bytes[(at + 12)..]));
        }

        return new Float16VectorSet(dimensions, rows, regions);
    }

    /// <summary>
    /// A CRC only proves the bytes are the worker's; this cheap look (one pass, as deriving the sign codes is)
    /// refuses rows no encoder makes: a NaN or infinity (whose sign bit would mislead the sign codes) or a row
    /// longer than a unit row.
    /// </summary>
    private static void CheckRows(ReadOnlySpan<Half> rows, int dimensions)
    {
        var row = ArrayPool<float>.Shared.Rent(dimensions);
        try
        {
            var floats = row.AsSpan(0, dimensions);
            for (var start = 0; start < rows.Length; start += dimensions)
            {
                TensorPrimitives.ConvertToSingle(rows.Slice(start, dimensions), floats);
                var squaredNorm = TensorPrimitives.SumOfSquares<float>(floats);
                if (!float.IsFinite(squaredNorm) || squaredNorm > MaxSquaredNorm)
                {
                    throw new FormatException($"vector set row {start / dimensions} has squared norm {squaredNorm}; rows are unit vectors");
                }
            }
        }
        finally
        {
            ArrayPool<float>.Shared.Return(row);
        }
    }
}
