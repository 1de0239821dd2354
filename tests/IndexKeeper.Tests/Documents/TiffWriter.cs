using System.Buffers.Binary;

namespace IndexKeeper.Tests.Documents;

/// <summary>
/// Writes baseline TIFF files by hand (TIFF 6.0 §2 structure, §8 baseline RGB image, §9 PackBits): one
/// uncompressed or PackBits strip per page, little-endian, pages chained through their IFDs.
/// </summary>
internal static class TiffWriter
{
    public static byte[] Rgb(IReadOnlyList<(int Width, int Height, byte[] Rgb)> pages, bool packBits = false)
    {
        var output = new MemoryStream();
        output.Write("II*\0"u8);
        var firstIfdAt = output.Position;
        output.Write(new byte[4]);
        var linkAt = firstIfdAt;
        foreach (var (width, height, rgb) in pages)
        {
            var data = packBits ? PackBits(rgb, width * 3) : rgb;
            var dataAt = output.Position;
            output.Write(data);
            if (output.Position % 2 == 1)
            {
                output.WriteByte(0); // IFDs start on a word boundary (§2)
            }

            var bitsAt = output.Position;
            output.Write([8, 0, 8, 0, 8, 0]);
            var ifdAt = output.Position;
            Patch(output, linkAt, (uint)ifdAt);
            (ushort Tag, ushort Type, uint Value)[] entries =
            [
                (256, 4, (uint)width), // ImageWidth
                (257, 4, (uint)height), // ImageLength
                (258, 3, (uint)bitsAt), // BitsPerSample: three SHORTs stored elsewhere
                (259, 3, packBits ? 32773u : 1u), // Compression
                (262, 3, 2), // PhotometricInterpretation: RGB
                (273, 4, (uint)dataAt), // StripOffsets
                (277, 3, 3), // SamplesPerPixel
                (278, 4, (uint)height), // RowsPerStrip
                (279, 4, (uint)data.Length), // StripByteCounts
            ];
            WriteUInt16(output, (ushort)entries.Length);
            foreach (var (tag, type, value) in entries)
            {
                WriteUInt16(output, tag);
                WriteUInt16(output, type);
                WriteUInt32(output, tag == 258 ? 3u : 1u);
                if (type == 3 && tag != 258)
                {
                    WriteUInt16(output, (ushort)value);
                    WriteUInt16(output, 0);
                }
                else
                {
                    WriteUInt32(output, value);
                }
            }

            linkAt = output.Position;
            WriteUInt32(output, 0);
        }

        return output.ToArray();
    }

    /// <summary>PackBits (TIFF 6.0 §9): per row, literal runs of up to 128 bytes (header n-1) and repeats (header 1-n).</summary>
    private static byte[] PackBits(byte[] data, int rowBytes)
    {
        var output = new MemoryStream();
        for (var row = 0; row < data.Length; row += rowBytes)
        {
            var i = row;
            var end = row + rowBytes;
            while (i < end)
            {
                var run = 1;
                while (i + run < end && data[i + run] == data[i] && run < 128)
                {
                    run++;
                }

                if (run >= 2)
                {
                    output.WriteByte((byte)(sbyte)(1 - run));
                    output.WriteByte(data[i]);
                    i += run;
                    continue;
                }

                var count = Math.Min(128, end - i);
                output.WriteByte((byte)(count - 1));
                output.Write(data, i, count);
                i += count;
            }
        }

        return output.ToArray();
    }

    private static void Patch(MemoryStream output, long at, uint value)
    {
        var here = output.Position;
        output.Position = at;
        WriteUInt32(output, value);
        output.Position = here;
    }

    private static void WriteUInt16(Stream output, ushort value)
    {
        Span<byte> bytes = stackalloc byte[2];
        BinaryPrimitives.WriteUInt16LittleEndian(bytes, value);
        output.Write(bytes);
    }

    private static void WriteUInt32(Stream output, uint value)
    {
        Span<byte> bytes = stackalloc byte[4];
        BinaryPrimitives.WriteUInt32LittleEndian(bytes, value);
        output.Write(bytes);
    }
}
