using SixLabors.ImageSharp;
using SixLabors.ImageSharp.Compression.Zlib;
using SixLabors.ImageSharp.Formats.Tiff;
using SixLabors.ImageSharp.Formats.Tiff.Constants;
using SixLabors.ImageSharp.Metadata;
using SixLabors.ImageSharp.PixelFormats;

namespace IndexKeeper.Demo;

/// <summary>Scanned-looking page images: uneven grey paper, dust specks, a slight skew, and text-like
/// strokes (word blocks, handwriting, ruled boxes). A4 at 100 dots per inch.</summary>
internal static class ScanImageBuilder
{
    public const int Width = 827;
    public const int Height = 1169;
    public const int DotsPerInch = 100;

    public static PixelCanvas Paint(DemoRandom random, ScanLayout layout)
    {
        var canvas = new PixelCanvas(Width, Height, colour: false);
        Paper(canvas, random);
        int skewPerMille = random.Next(-12, 13);
        var ink = new ScanPen(canvas, skewPerMille);

        ink.TextLine(random, 60, 70, Width - 330, 14);
        ink.Rectangle(Width - 230, 48, 170, 50, 2);
        ink.TextLine(random, Width - 220, 80, 140, 9);
        switch (layout)
        {
            case ScanLayout.FieldSheet:
                FieldSheet(ink, random);
                break;
            case ScanLayout.DeliveryNote:
                DeliveryNote(ink, random);
                break;
            default:
                LogPage(ink, random);
                break;
        }

        return canvas;
    }

    /// <summary>A multi-page TIFF (TIFF 6.0, 8-bit grey, Deflate) of the given grey pages.</summary>
    public static byte[] MultiPageTiff(IReadOnlyList<PixelCanvas> pages)
    {
        using var document = Image.LoadPixelData<L8>(pages[0].Pixels, pages[0].Width, pages[0].Height);
        foreach (var page in pages.Skip(1))
        {
            using var next = Image.LoadPixelData<L8>(page.Pixels, page.Width, page.Height);
            document.Frames.AddFrame(next.Frames.RootFrame);
        }

        document.Metadata.ResolutionUnits = PixelResolutionUnit.PixelsPerInch;
        document.Metadata.HorizontalResolution = DotsPerInch;
        document.Metadata.VerticalResolution = DotsPerInch;
        using var output = new MemoryStream();
        document.Save(output, new TiffEncoder { Compression = TiffCompression.Deflate, CompressionLevel = DeflateCompressionLevel.Level3, BitsPerPixel = TiffBitsPerPixel.Bit8 });
        return output.ToArray();
    }

    /// <summary>Paper tone varying slowly (bilinear between random values on a coarse grid), then grain and specks.</summary>
    private static void Paper(PixelCanvas canvas, DemoRandom random)
    {
        const int Cell = 128;
        int columns = Width / Cell + 2;
        int rows = Height / Cell + 2;
        var tone = new int[columns * rows];
        for (int at = 0; at < tone.Length; at++)
        {
            tone[at] = random.Next(230, 247);
        }

        var pixels = canvas.Pixels;
        for (int y = 0; y < Height; y++)
        {
            int row = y / Cell;
            int fy = y % Cell;
            for (int x = 0; x < Width; x++)
            {
                int column = x / Cell;
                int fx = x % Cell;
                int top = tone[row * columns + column] * (Cell - fx) + tone[row * columns + column + 1] * fx;
                int bottom = tone[(row + 1) * columns + column] * (Cell - fx) + tone[(row + 1) * columns + column + 1] * fx;
                int grain = (int)(random.NextUInt64() % 5) - 2;
                pixels[y * Width + x] = (byte)((top * (Cell - fy) + bottom * fy) / (Cell * Cell) + grain);
            }
        }

        for (int speck = 0; speck < 220; speck++)
        {
            int size = random.Next(1, 3);
            canvas.FillRectangle(random.Next(Width), random.Next(Height), size, size, DemoColour.OfGrey(random.Next(110, 200)));
        }
    }

    private static void FieldSheet(ScanPen ink, DemoRandom random)
    {
        int y = 150;
        for (int box = 0; box < 6; box++)
        {
            ink.Rectangle(60, y, Width - 120, 92, 2);
            ink.TextLine(random, 72, y + 22, 180, 8);
            ink.Handwriting(random, 300, y + 50, random.Next(160, 420));
            y += 110;
        }

        for (int check = 0; check < 5; check++)
        {
            ink.Rectangle(72 + check * 140, y + 10, 22, 22, 2);
            ink.TextLine(random, 102 + check * 140, y + 28, 80, 7);
            if (random.Chance(70))
            {
                ink.Handwriting(random, 76 + check * 140, y + 20, 14);
            }
        }

        ink.Handwriting(random, Width - 320, Height - 120, 200);
        ink.Ring(Width - 180, Height - 230, 70, 4);
        ink.TextLine(random, Width - 225, Height - 225, 90, 10);
    }

    private static void DeliveryNote(ScanPen ink, DemoRandom random)
    {
        int y = 170;
        for (int line = 0; line < 5; line++)
        {
            ink.TextLine(random, 60, y, random.Next(300, 640), 9);
            y += 28;
        }

        y += 20;
        int[] columns = [60, 160, 520, 640, Width - 60];
        int rows = random.Next(6, 11);
        for (int row = 0; row <= rows; row++)
        {
            ink.Rectangle(columns[0], y + row * 34, columns[^1] - columns[0], 1, 1);
        }

        foreach (int column in columns)
        {
            ink.Rectangle(column, y, 2, rows * 34, 1);
        }

        for (int row = 0; row < rows; row++)
        {
            for (int cell = 0; cell < columns.Length - 1; cell++)
            {
                int room = columns[cell + 1] - columns[cell] - 20;
                ink.TextLine(random, columns[cell] + 8, y + row * 34 + 22, random.Next(room / 3, room), 8);
            }
        }

        ink.Handwriting(random, 80, Height - 160, 260);
        ink.TextLine(random, 60, Height - 100, 300, 8);
    }

    private static void LogPage(ScanPen ink, DemoRandom random)
    {
        for (int y = 160; y < Height - 60; y += 34)
        {
            ink.Rectangle(40, y, Width - 80, 1, 1);
            if (random.Chance(85))
            {
                ink.Handwriting(random, 48, y - 8, 70);
                ink.Handwriting(random, 150, y - 8, random.Next(200, Width - 260));
            }
        }

        ink.Rectangle(136, 140, 2, Height - 200, 1);
    }
}
