using System.IO.Compression;
using System.Text;

namespace IndexKeeper.Tests.Documents;

/// <summary>
/// Encoders for the PDF filters the reader must undo, written from ISO 32000-1 §7.4 so tests can make
/// streams in every lossless encoding. qpdf decodes what they write in <see cref="StreamDecoderTests"/>,
/// which checks these encoders against an independent implementation.
/// </summary>
internal static class TestEncoders
{
    public static byte[] Flate(byte[] data, CompressionLevel level = CompressionLevel.Optimal)
    {
        // RFC 1950 zlib format, as FlateDecode expects (§7.4.4).
        var output = new MemoryStream();
        using (var zlib = new ZLibStream(output, level, leaveOpen: true))
        {
            zlib.Write(data);
        }

        return output.ToArray();
    }

    public static byte[] AsciiHex(byte[] data) => System.Text.Encoding.ASCII.GetBytes(Convert.ToHexString(data) + ">");

    /// <summary>§7.4.3: groups of four bytes as five base-85 digits from '!', 'z' for four zeros, "~>" at the end.</summary>
    public static byte[] Ascii85(byte[] data)
    {
        var text = new StringBuilder();
        for (var i = 0; i < data.Length; i += 4)
        {
            var n = Math.Min(4, data.Length - i);
            uint value = 0;
            for (var j = 0; j < 4; j++)
            {
                value = (value << 8) | (j < n ? data[i + j] : 0u);
            }

            if (n == 4 && value == 0)
            {
                text.Append('z');
                continue;
            }

            var digits = new char[5];
            for (var j = 4; j >= 0; j--)
            {
                digits[j] = (char)('!' + (value % 85));
                value /= 85;
            }

            text.Append(digits, 0, n + 1);
            if (i % 64 == 60)
            {
                text.Append('\n');
            }
        }

        return System.Text.Encoding.ASCII.GetBytes(text.Append("~>").ToString());
    }

    /// <summary>§7.4.5: runs of equal bytes as (257 - n, byte), other bytes as literal runs of up to 128.</summary>
    public static byte[] RunLength(byte[] data)
    {
        var output = new MemoryStream();
        var i = 0;
        while (i < data.Length)
        {
            var run = 1;
            while (i + run < data.Length && data[i + run] == data[i] && run < 128)
            {
                run++;
            }

            if (run >= 2)
            {
                output.WriteByte((byte)(257 - run));
                output.WriteByte(data[i]);
                i += run;
                continue;
            }

            var start = i;
            while (i < data.Length && i - start < 128 && (i + 1 >= data.Length || data[i + 1] != data[i]))
            {
                i++;
            }

            if (i == start)
            {
                i++;
            }

            output.WriteByte((byte)(i - start - 1));
            output.Write(data, start, i - start);
        }

        output.WriteByte(128);
        return output.ToArray();
    }

    /// <summary>
    /// §7.4.4.2 LZW with EarlyChange 1: starts with a clear-table code, 9- to 12-bit codes high bit first.
    /// The decoder adds each table entry one code after the encoder, so the encoder widens its codes
    /// when its next free code reaches 2^width.
    /// </summary>
    public static byte[] Lzw(byte[] data)
    {
        var bits = new BitWriter();
        var table = new Dictionary<(int, byte), int>();
        var width = 9;
        var nextCode = 258;
        bits.Write(256, width);
        var current = -1;
        foreach (var b in data)
        {
            if (current < 0)
            {
                current = b;
                continue;
            }

            if (table.TryGetValue((current, b), out var code))
            {
                current = code;
                continue;
            }

            bits.Write(current, width);
            table[(current, b)] = nextCode++;
            if (nextCode >= (1 << width) && width < 12)
            {
                width++;
            }

            if (nextCode >= 4094)
            {
                bits.Write(256, width);
                table.Clear();
                nextCode = 258;
                width = 9;
            }

            current = b;
        }

        if (current >= 0)
        {
            bits.Write(current, width);
            nextCode++;
            if (nextCode >= (1 << width) && width < 12)
            {
                width++;
            }
        }

        bits.Write(257, width);
        return bits.ToArray();
    }

    /// <summary>PNG row filters (PNG specification §9) cycling through None, Sub, Up, Average and Paeth.</summary>
    public static byte[] PngPredict(byte[] data, int bytesPerPixel, int rowLength)
    {
        var output = new MemoryStream();
        var previous = new byte[rowLength];
        for (var row = 0; row * rowLength < data.Length; row++)
        {
            var current = data.AsSpan(row * rowLength, Math.Min(rowLength, data.Length - (row * rowLength))).ToArray();
            var type = row % 5;
            output.WriteByte((byte)type);
            for (var i = 0; i < current.Length; i++)
            {
                int left = i >= bytesPerPixel ? current[i - bytesPerPixel] : 0;
                int up = previous[i];
                int upLeft = i >= bytesPerPixel ? previous[i - bytesPerPixel] : 0;
                var predicted = type switch
                {
                    1 => left,
                    2 => up,
                    3 => (left + up) >> 1,
                    4 => Paeth(left, up, upLeft),
                    _ => 0,
                };
                output.WriteByte((byte)(current[i] - predicted));
            }

            Array.Clear(previous);
            current.CopyTo(previous, 0);
        }

        return output.ToArray();
    }

    /// <summary>TIFF predictor 2 (TIFF 6.0 §14) for 8-bit samples: each byte minus the same component one pixel left.</summary>
    public static byte[] TiffPredict(byte[] data, int colors, int rowLength)
    {
        var output = (byte[])data.Clone();
        for (var row = 0; row < data.Length; row += rowLength)
        {
            for (var i = Math.Min(data.Length, row + rowLength) - 1; i >= row + colors; i--)
            {
                output[i] = (byte)(data[i] - data[i - colors]);
            }
        }

        return output;
    }

    private static int Paeth(int a, int b, int c)
    {
        var p = a + b - c;
        var pa = Math.Abs(p - a);
        var pb = Math.Abs(p - b);
        var pc = Math.Abs(p - c);
        return pa <= pb && pa <= pc ? a : pb <= pc ? b : c;
    }

    private sealed class BitWriter
    {
        private readonly MemoryStream output = new();
        private int buffer;
        private int count;

        public void Write(int code, int width)
        {
            buffer = (buffer << width) | code;
            count += width;
            while (count >= 8)
            {
                output.WriteByte((byte)(buffer >> (count - 8)));
                count -= 8;
                buffer &= (1 << count) - 1;
            }
        }

        public byte[] ToArray()
        {
            if (count > 0)
            {
                output.WriteByte((byte)(buffer << (8 - count)));
                count = 0;
            }

            return output.ToArray();
        }
    }
}
