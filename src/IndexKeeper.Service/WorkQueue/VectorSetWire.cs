using System.Buffers.Binary;
using System.Runtime.InteropServices;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Service.WorkQueue;

/// <summary>
/// A vector set as a worker hands it back in <c>jobs.result</c> (docs/work-queue.md, "Result bytes",
/// whose version matches <see cref="Version"/>): full float32 rows and region boxes, exactly as the
/// encoder made them, so the coordinator stores the same bytes a local encoder call would have given it.
/// The reader checks the magic, the version, the sizes and the CRC-32C before it trusts a byte.
/// </summary>
internal static class VectorSetWire
{
    /// <summary>Layout version. Never reuse a number.</summary>
    public const ushort Version = 1;

    private const int HeaderBytes = 16;
    private const int ChecksumBytes = 4;

    // "IKVW", never change.
    private static ReadOnlySpan<byte> Magic => "IKVW"u8;

    public static byte[] Write(VectorSet vectors)
    {
        ArgumentNullException.ThrowIfNull(vectors);
        var floats = vectors.Vectors.Length + (vectors.Count * 4);
        var bytes = new byte[HeaderBytes + (floats * sizeof(float)) + ChecksumBytes];
        var span = bytes.AsSpan();
        Magic.CopyTo(span);
        BinaryPrimitives.WriteUInt16LittleEndian(span[4..], Version);
        BinaryPrimitives.WriteInt32LittleEndian(span[8..], vectors.Dimensions);
        BinaryPrimitives.WriteInt32LittleEndian(span[12..], vectors.Count);
        var at = HeaderBytes;
        foreach (var value in vectors.Vectors)
        {
            BinaryPrimitives.WriteSingleLittleEndian(span[at..], value);
            at += sizeof(float);
        }

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
    public static VectorSet Read(ReadOnlySpan<byte> bytes)
    {
        if (bytes.Length < HeaderBytes + ChecksumBytes || !bytes[..4].SequenceEqual(Magic))
        {
            throw new FormatException("not a vector set of the work queue (magic)");
        }

        var version = BinaryPrimitives.ReadUInt16LittleEndian(bytes[4..]);
        if (version != Version)
        {
            throw new FormatException($"vector set bytes of version {version}; this build reads version {Version}");
        }

        var body = bytes.Length - ChecksumBytes;
        if (BinaryPrimitives.ReadUInt32LittleEndian(bytes[body..]) != Crc32C.Compute(bytes[..body]))
        {
            throw new FormatException("vector set bytes fail their CRC-32C");
        }

        var dimensions = BinaryPrimitives.ReadInt32LittleEndian(bytes[8..]);
        var count = BinaryPrimitives.ReadInt32LittleEndian(bytes[12..]);
        if (dimensions <= 0 || count < 0 || (long)count * (dimensions + 4) * sizeof(float) != body - HeaderBytes)
        {
            throw new FormatException($"vector set bytes of {body - HeaderBytes} for {count} rows of {dimensions}");
        }

        // One copy of the rows, straight from the bytes where the machine is little-endian (as the format).
        var values = count * dimensions;
        var rows = BitConverter.IsLittleEndian ? MemoryMarshal.Cast<byte, float>(bytes[HeaderBytes..body])[..values].ToArray() : new float[values];
        var at = HeaderBytes;
        if (!BitConverter.IsLittleEndian)
        {
            for (var i = 0; i < values; i++, at += sizeof(float))
            {
                rows[i] = BinaryPrimitives.ReadSingleLittleEndian(bytes[at..]);
            }
        }

        at = HeaderBytes + (values * sizeof(float));
        var regions = new PageBox[count];
        for (var i = 0; i < count; i++, at += 4 * sizeof(float))
        {
            regions[i] = new PageBox(
                BinaryPrimitives.ReadSingleLittleEndian(bytes[at..]),
                BinaryPrimitives.ReadSingleLittleEndian(bytes[(at + 4)..]),
                BinaryPrimitives.ReadSingleLittleEndian(bytes[(at + 8)..]),
                BinaryPrimitives.ReadSingleLittleEndian(bytes[(at + 12)..]));
        }

        return new VectorSet(dimensions, rows, regions);
    }
}
