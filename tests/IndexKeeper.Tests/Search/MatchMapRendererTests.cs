using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Search;
using IndexKeeper.Tests.Demo;
using IndexKeeper.Tests.Support;
using SixLabors.ImageSharp;
using SixLabors.ImageSharp.PixelFormats;
using UglyToad.PdfPig.Core;
using UglyToad.PdfPig.Writer;

namespace IndexKeeper.Tests.Search;

public sealed class MatchMapRendererTests
{
    [Fact]
    public void The_png_shows_word_boxes_and_each_token_region_in_its_colour()
    {
        // An A4-sized page (595 × 842 points) drawn 595 pixels wide, so one point is one pixel.
        PageBox[] words = [new(50, 700, 150, 720), new(200, 700, 300, 720), new(50, 100, 150, 120)];
        PageBox[] regions = [new(200, 700, 300, 720), new(50, 100, 150, 120)];
        using var png = new MemoryStream();
        MatchMapRenderer.WritePng(png, 595, 842, words, regions, widthPixels: 595);

        // PNG signature, ISO/IEC 15948 (PNG specification) section 5.2.
        Assert.Equal(new byte[] { 0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A }, png.ToArray()[..8]);

        // Decoded by an independent library (ImageSharp from the registry).
        png.Position = 0;
        using var image = Image.Load<Rgba32>(png);
        Assert.Equal((595, 842), (image.Width, image.Height));
        Assert.Equal(new Rgba32(255, 255, 255, 255), image[400, 400]);

        // The word without a match is light grey; page y = 710 is pixel row 842 − 710 = 132.
        Assert.Equal(new Rgba32(0xE6, 0xE6, 0xE6, 255), image[100, 132]);

        // Token 0 and token 1 each tint their region towards their own colour.
        AssertTinted(image[250, 132], MatchMapRenderer.TokenColour(0));
        AssertTinted(image[100, 842 - 110], MatchMapRenderer.TokenColour(1));
        Assert.NotEqual(image[250, 132], image[100, 842 - 110]);
    }

    [Theory]
    [InlineData(0)]
    [InlineData(90)]
    [InlineData(270)]
    public void A_pdf_page_is_drawn_under_the_regions_in_its_unrotated_space(int rotation)
    {
        // A4 with a filled square at (400, 100)-(500, 200) in page space; the rotated copies are made by
        // Debian's qpdf (--rotate sets /Rotate, ISO 32000-1 §7.7.3.3), which changes how a viewer shows the
        // page but not the page space its words and regions are in.
        using var temp = new TempDirectory();
        var path = temp.Combine("square.pdf");
        File.WriteAllBytes(path, SquarePdf());
        if (rotation != 0)
        {
            var rotated = temp.Combine("rotated.pdf");
            Assert.Equal(0, ExternalTool.Run("qpdf", $"--rotate=+{rotation}", path, rotated).ExitCode);
            path = rotated;
        }

        using var png = new MemoryStream();
        var fallback = MatchMapRenderer.WritePng(png, 595, 842, [], [new PageBox(50, 700, 150, 720)], widthPixels: 595, backdrop: new MapBackdrop(path, DocumentKind.Pdf, 1, rotation));

        Assert.Null(fallback);
        png.Position = 0;
        using var image = Image.Load<Rgba32>(png);
        Assert.Equal((595, 842), (image.Width, image.Height));
        Assert.True(image[450, 842 - 150].R < 60, $"the square is not drawn where the page has it: {image[450, 842 - 150]}");
        Assert.True(image[150, 842 - 400].R > 200, $"ink where the page has none: {image[150, 842 - 400]}");
        AssertTinted(image[100, 842 - 710], MatchMapRenderer.TokenColour(0));
    }

    [Fact]
    public void A_png_page_is_drawn_as_it_is_and_other_kinds_fall_back_to_word_boxes()
    {
        using var temp = new TempDirectory();
        var path = temp.Combine("scan.png");
        using (var scan = new Image<Rgba32>(200, 100, new Rgba32(255, 255, 255, 255)))
        {
            for (var x = 0; x < 100; x++)
            {
                for (var y = 0; y < 100; y++)
                {
                    scan[x, y] = new Rgba32(0, 0, 0, 255);
                }
            }

            scan.SaveAsPng(path);
        }

        using var drawn = new MemoryStream();
        using var boxes = new MemoryStream();
        Assert.Null(MatchMapRenderer.WritePng(drawn, 200, 100, [new PageBox(120, 40, 180, 60)], [], widthPixels: 200, backdrop: new MapBackdrop(path, DocumentKind.Png, 1, 0)));
        var why = MatchMapRenderer.WritePng(boxes, 200, 100, [new PageBox(120, 40, 180, 60)], [], widthPixels: 200, backdrop: new MapBackdrop(path, DocumentKind.Tiff, 1, 0));

        drawn.Position = 0;
        boxes.Position = 0;
        using var overPage = Image.Load<Rgba32>(drawn);
        using var overBoxes = Image.Load<Rgba32>(boxes);
        Assert.True(overPage[50, 50].R < 30 && overPage[150, 50].R > 225, $"{overPage[50, 50]} {overPage[150, 50]}");
        Assert.Contains("Tiff", why, StringComparison.Ordinal);
        Assert.Equal(new Rgba32(255, 255, 255, 255), overBoxes[50, 50]);
        Assert.Equal(new Rgba32(0xE6, 0xE6, 0xE6, 255), overBoxes[150, 50]);
    }

    [Fact]
    public void Bad_page_sizes_are_refused()
    {
        using var png = new MemoryStream();
        Assert.Throws<ArgumentException>(() => MatchMapRenderer.WritePng(png, 0, 842, [], []));
        Assert.Throws<ArgumentOutOfRangeException>(() => MatchMapRenderer.WritePng(png, 595, 842, [], [], widthPixels: 1));
    }

    private static byte[] SquarePdf()
    {
        using var builder = new PdfDocumentBuilder();
        var page = builder.AddPage(595, 842);
        page.SetTextAndFillColor(0, 0, 0);
        page.DrawRectangle(new PdfPoint(400, 100), 100, 100, 1, fill: true);
        return builder.Build();
    }

    private static void AssertTinted(Rgba32 pixel, SkiaSharp.SKColor colour)
    {
        // Over the grey word fill the strongest channel of the token colour must stay the strongest of the pixel.
        int[] expected = [colour.Red, colour.Green, colour.Blue];
        int[] actual = [pixel.R, pixel.G, pixel.B];
        Assert.Equal(Array.IndexOf(expected, expected.Max()), Array.IndexOf(actual, actual.Max()));
        Assert.NotEqual(new Rgba32(0xE6, 0xE6, 0xE6, 255), pixel);
    }
}
