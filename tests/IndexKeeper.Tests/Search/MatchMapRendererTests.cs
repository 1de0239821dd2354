using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Search;
using SixLabors.ImageSharp;
using SixLabors.ImageSharp.PixelFormats;

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

    [Fact]
    public void Bad_page_sizes_are_refused()
    {
        using var png = new MemoryStream();
        Assert.Throws<ArgumentException>(() => MatchMapRenderer.WritePng(png, 0, 842, [], []));
        Assert.Throws<ArgumentOutOfRangeException>(() => MatchMapRenderer.WritePng(png, 595, 842, [], [], widthPixels: 1));
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
