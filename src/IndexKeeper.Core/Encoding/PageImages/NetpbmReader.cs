namespace IndexKeeper.Core.Encoding.PageImages;

/// <summary>
/// Reads binary PPM (P6) and PGM (P5) images as the Netpbm format specifications define them
/// (netpbm.sourceforge.net/doc/ppm.html and pgm.html): magic, white space, width, white space, height,
/// white space, maxval (1..65535), one white-space character, then the raster, rows top to bottom, samples
/// of one byte when maxval &lt; 256 and of two bytes most significant first otherwise. Before the
/// character that ends the header, "#" through the next CR or LF is a comment and is ignored. A stream may
/// hold several images back to back with nothing between them (how pdftoppm writes pages to stdout).
/// </summary>
internal static class NetpbmReader
{
    /// <summary>Refuses a header that asks for more raster bytes than this (a malformed or hostile header).</summary>
    public const long MaxRasterBytes = 1L << 30;

    /// <summary>The next image, scaled to 8 bits a sample; null at a clean end of the stream (no byte left).</summary>
    /// <exception cref="InvalidDataException">The bytes are not a P5/P6 image, or end inside one.</exception>
    public static RasterImage? Read(Stream stream)
    {
        ArgumentNullException.ThrowIfNull(stream);
        var first = stream.ReadByte();
        if (first < 0)
        {
            return null;
        }

        var second = stream.ReadByte();
        var channels = (first, second) switch
        {
            ('P', '6') => 3,
            ('P', '5') => 1,
            _ => throw new InvalidDataException($"not a binary PPM or PGM image (magic bytes {first:X2} {second:X2})"),
        };
        var header = new HeaderReader(stream);
        var width = header.Number("width");
        var height = header.Number("height");
        var maxval = header.Number("maxval");
        if (width < 1 || height < 1 || maxval is < 1 or > 65535)
        {
            throw new InvalidDataException($"bad PPM/PGM header: width {width}, height {height}, maxval {maxval}");
        }

        var bytesPerSample = maxval < 256 ? 1 : 2;
        var samples = (long)width * height * channels;
        if (samples * bytesPerSample > MaxRasterBytes)
        {
            throw new InvalidDataException($"a {width}×{height} image is larger than {MaxRasterBytes} raster bytes");
        }

        var raster = new byte[samples * bytesPerSample];
        try
        {
            stream.ReadExactly(raster);
        }
        catch (EndOfStreamException e)
        {
            throw new InvalidDataException($"the {width}×{height} image ends inside its raster", e);
        }

        return new RasterImage((int)width, (int)height, channels, ToEightBits(raster, (int)samples, maxval, bytesPerSample));
    }

    // Samples scaled from 0..maxval to 0..255, rounded to nearest.
    private static byte[] ToEightBits(byte[] raster, int samples, long maxval, int bytesPerSample)
    {
        if (bytesPerSample == 1 && maxval == 255)
        {
            return raster;
        }

        var result = new byte[samples];
        for (var i = 0; i < samples; i++)
        {
            long value = bytesPerSample == 1 ? raster[i] : (raster[2 * i] << 8) | raster[(2 * i) + 1];
            if (value > maxval)
            {
                throw new InvalidDataException($"sample {value} is above maxval {maxval}");
            }

            result[i] = (byte)(((value * 255) + (maxval / 2)) / maxval);
        }

        return result;
    }

    private sealed class HeaderReader(Stream stream)
    {
        public long Number(string what)
        {
            var c = Next();
            while (IsWhiteSpace(c))
            {
                c = Next();
            }

            if (c is < '0' or > '9')
            {
                throw new InvalidDataException($"bad PPM/PGM header: {what} expected, found {Describe(c)}");
            }

            long value = 0;
            while (c is >= '0' and <= '9')
            {
                value = (value * 10) + (c - '0');
                if (value > int.MaxValue)
                {
                    throw new InvalidDataException($"bad PPM/PGM header: {what} is too large");
                }

                c = Next();
            }

            // The character after width and height is white space (or a comment, skipped by Next); after
            // maxval exactly one white-space character, and the raster starts right after it.
            if (!IsWhiteSpace(c))
            {
                throw new InvalidDataException($"bad PPM/PGM header: white space expected after {what}, found {Describe(c)}");
            }

            return value;
        }

        // The next header byte with comments removed ("#" through the next CR or LF, both included).
        private int Next()
        {
            var c = stream.ReadByte();
            while (c == '#')
            {
                do
                {
                    c = stream.ReadByte();
                }
                while (c is >= 0 and not ('\n' or '\r'));

                c = c < 0 ? c : stream.ReadByte();
            }

            if (c < 0)
            {
                throw new InvalidDataException("the PPM/PGM header is cut off");
            }

            return c;
        }

        // The specification's white space: blanks, TABs, CRs, LFs.
        private static bool IsWhiteSpace(int c) => c is ' ' or '\t' or '\r' or '\n';

        private static string Describe(int c) => c is >= 0x21 and < 0x7F ? $"'{(char)c}'" : $"byte {c:X2}";
    }
}
