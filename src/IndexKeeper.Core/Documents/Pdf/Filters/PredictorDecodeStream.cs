namespace IndexKeeper.Core.Documents.Pdf.Filters;

/// <summary>
/// Undoes the predictor of a Flate or LZW stream (ISO 32000-1 §7.4.4.4, Table 8): 2 is the TIFF
/// horizontal predictor (TIFF 6.0 §14), 10..15 are the PNG row filters (PNG specification §9), where
/// each row starts with its own filter-type byte whatever the number says.
/// </summary>
internal sealed class PredictorDecodeStream : DecodeStream
{
    private const int MaxRowBytes = 1 << 24;

    private readonly int predictor;
    private readonly int colors;
    private readonly int bitsPerComponent;
    private readonly int bytesPerPixel;
    private readonly byte[] row;
    private readonly byte[] previousRow;

    public PredictorDecodeStream(Stream source, int predictor, int colors, int bitsPerComponent, int columns)
        : base(source)
    {
        this.predictor = predictor;
        this.colors = Math.Clamp(colors, 1, 32);
        this.bitsPerComponent = bitsPerComponent is 1 or 2 or 4 or 8 or 16 ? bitsPerComponent : 8;
        columns = Math.Clamp(columns, 1, 1 << 24);
        bytesPerPixel = Math.Max(1, ((this.colors * this.bitsPerComponent) + 7) / 8);
        // A row longer than 16 MiB is nonsense from a damaged or hostile file; cap the buffer.
        var rowLength = (int)Math.Min(MaxRowBytes, ((long)this.colors * this.bitsPerComponent * columns + 7) / 8);
        row = new byte[rowLength];
        previousRow = new byte[rowLength];
    }

    /// <summary>True when the parameters ask for a predictor at all (1 or absent means none).</summary>
    public static bool Applies(int predictor) => predictor == 2 || predictor >= 10;

    protected override bool Produce()
    {
        while (Pending < 4096)
        {
            var filterType = 0;
            if (predictor >= 10)
            {
                filterType = NextByte();
                if (filterType < 0)
                {
                    return false;
                }
            }

            var filled = 0;
            while (filled < row.Length)
            {
                var b = NextByte();
                if (b < 0)
                {
                    break;
                }

                row[filled++] = (byte)b;
            }

            if (filled == 0)
            {
                return false;
            }

            // A short last row is decoded as far as it goes (common practice of PDF readers).
            var span = row.AsSpan(0, filled);
            if (predictor >= 10)
            {
                UndoPng(filterType, span);
            }
            else
            {
                UndoTiff(span);
            }

            Emit(span);
            span.CopyTo(previousRow);
            if (filled < row.Length)
            {
                return false;
            }
        }

        return true;
    }

    private void UndoPng(int filterType, Span<byte> current)
    {
        var above = previousRow.AsSpan(0, current.Length);
        for (var i = 0; i < current.Length; i++)
        {
            int left = i >= bytesPerPixel ? current[i - bytesPerPixel] : 0;
            int up = above[i];
            int upLeft = i >= bytesPerPixel ? above[i - bytesPerPixel] : 0;
            current[i] = filterType switch
            {
                1 => (byte)(current[i] + left),
                2 => (byte)(current[i] + up),
                3 => (byte)(current[i] + ((left + up) >> 1)),
                4 => (byte)(current[i] + Paeth(left, up, upLeft)),
                _ => current[i],
            };
        }
    }

    private static int Paeth(int a, int b, int c)
    {
        var p = a + b - c;
        var pa = Math.Abs(p - a);
        var pb = Math.Abs(p - b);
        var pc = Math.Abs(p - c);
        return pa <= pb && pa <= pc ? a : pb <= pc ? b : c;
    }

    private void UndoTiff(Span<byte> current)
    {
        if (bitsPerComponent == 8)
        {
            for (var i = colors; i < current.Length; i++)
            {
                current[i] = (byte)(current[i] + current[i - colors]);
            }

            return;
        }

        if (bitsPerComponent == 16)
        {
            for (var i = colors * 2; i + 1 < current.Length; i += 2)
            {
                var value = ((current[i] << 8) | current[i + 1]) + ((current[i - (colors * 2)] << 8) | current[i - (colors * 2) + 1]);
                current[i] = (byte)(value >> 8);
                current[i + 1] = (byte)value;
            }

            return;
        }

        // 1, 2 or 4 bits: add sample-wise modulo 2^bits, samples packed high bit first.
        var samples = current.Length * 8 / bitsPerComponent;
        var mask = (1 << bitsPerComponent) - 1;
        for (var s = colors; s < samples; s++)
        {
            var value = (GetSample(current, s) + GetSample(current, s - colors)) & mask;
            SetSample(current, s, value);
        }
    }

    private int GetSample(Span<byte> data, int index)
    {
        var bit = index * bitsPerComponent;
        return (data[bit >> 3] >> (8 - bitsPerComponent - (bit & 7))) & ((1 << bitsPerComponent) - 1);
    }

    private void SetSample(Span<byte> data, int index, int value)
    {
        var bit = index * bitsPerComponent;
        var shift = 8 - bitsPerComponent - (bit & 7);
        var mask = ((1 << bitsPerComponent) - 1) << shift;
        data[bit >> 3] = (byte)((data[bit >> 3] & ~mask) | (value << shift));
    }
}
