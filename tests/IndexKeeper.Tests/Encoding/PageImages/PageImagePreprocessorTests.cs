using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding.PageImages;

namespace IndexKeeper.Tests.Encoding.PageImages;

/// <summary>The pure half of the page-image path: placement, resampling and normalisation, rotation, patch regions, page runs.</summary>
public sealed class PageImagePreprocessorTests
{
    private static readonly double[] Mean = [0.5, 0.25, 0.0];
    private static readonly double[] Std = [0.5, 0.25, 1.0];

    [Fact]
    public void Same_size_raster_is_normalised_per_channel_into_planes()
    {
        var raster = new RasterImage(2, 1, 3, [255, 0, 51, 0, 255, 102]);
        var input = Fill(raster, 2, 1, PageImageFit.Stretch);

        // (v / 255 − mean) / std, channel planes R, G, B (NCHW).
        Assert.Equal(new[] { 1f, -1f, -1f, 3f, 0.2f, 0.4f }, input, new Tolerance(1e-6f));
    }

    [Fact]
    public void Halving_averages_each_two_by_two_block()
    {
        var grey = new byte[] { 0, 100, 200, 40, 20, 60, 0, 80 }; // 4×2
        var input = Fill(new RasterImage(4, 2, 1, grey), 2, 1, PageImageFit.Stretch);

        // Blocks: (0 + 100 + 20 + 60) / 4 = 45 and (200 + 40 + 0 + 80) / 4 = 80; grey feeds all three channels.
        Assert.Equal(Normalised(45, 0), input[0], 4);
        Assert.Equal(Normalised(80, 0), input[1], 4);
        Assert.Equal(Normalised(45, 2), input[4], 4);
    }

    [Fact]
    public void Letterbox_centres_the_page_and_pads_with_white()
    {
        // A black 2×1 raster in a 2×4 input: scale 1, centred at input rows 1.5 to 2.5.
        var placement = PagePlacement.Of(2, 1, 2, 4, PageImageFit.Letterbox);
        Assert.Equal((1.0, 1.0, 0.0, 1.5), (placement.ScaleX, placement.ScaleY, placement.OffsetX, placement.OffsetY));

        var input = Fill(new RasterImage(2, 1, 1, [0, 0]), 2, 4, PageImageFit.Letterbox);

        // Input rows 1 and 2 each cover half a source row and half padding: grey 127.5.
        Assert.Equal(Normalised(255, 0), input[0], 4);
        Assert.Equal(Normalised(127.5, 0), input[2], 4);
        Assert.Equal(Normalised(127.5, 0), input[4], 4);
        Assert.Equal(Normalised(255, 0), input[6], 4);
    }

    [Fact]
    public void Rotation_turns_clockwise_as_a_viewer_shows_it()
    {
        // 3×2 image, pixels a b c / d e f; turned 90° clockwise it is 2×3: d a / e b / f c.
        var image = new RasterImage(3, 2, 1, [1, 2, 3, 4, 5, 6]);

        Assert.Equal(new byte[] { 4, 1, 5, 2, 6, 3 }, image.RotateClockwise(90).Pixels);
        Assert.Equal(new byte[] { 6, 5, 4, 3, 2, 1 }, image.RotateClockwise(180).Pixels);
        Assert.Equal(new byte[] { 3, 6, 2, 5, 1, 4 }, image.RotateClockwise(270).Pixels);
        Assert.Equal((2, 3), (image.RotateClockwise(270).Width, image.RotateClockwise(270).Height));
    }

    [Theory]
    [InlineData(0)]
    [InlineData(90)]
    [InlineData(180)]
    [InlineData(270)]
    public void Patch_regions_tile_the_unrotated_page(int rotation)
    {
        // A 600×400 page (before rotation), drawn as displayed at 1 pixel a unit, fitted into 128×160 in 32-pixel patches.
        var quarter = rotation is 90 or 270;
        var placement = PagePlacement.Of(quarter ? 400 : 600, quarter ? 600 : 400, 128, 160, PageImageFit.Letterbox);

        var regions = PatchGrid.Regions(128, 160, 32, placement, 600, 400, rotation);

        AssertTiles(regions.Select(r => r.Region).ToList(), 600, 400);
    }

    [Fact]
    public void Patches_that_show_only_padding_are_dropped()
    {
        // 800×200 into 128×160: scale 0.16, the page fills input rows 64..96, which is patch row 2 only.
        var placement = PagePlacement.Of(800, 200, 128, 160, PageImageFit.Letterbox);

        var regions = PatchGrid.Regions(128, 160, 32, placement, 800, 200, 0);

        Assert.Equal(new[] { 8, 9, 10, 11 }, regions.Select(r => r.Patch));
        Assert.Equal(new PageBox(0, 0, 200, 200), regions[0].Region, BoxComparer.Instance);
    }

    [Fact]
    public void Consecutive_pages_form_one_run()
    {
        Assert.Equal(new[] { (1, 3), (5, 6), (9, 9) }, PageImageEncoder.Runs([1, 2, 3, 5, 6, 9]));
        Assert.Empty(PageImageEncoder.Runs([]));
    }

    /// <summary>Every box inside the page, no two overlapping, areas summing to the page's: a tiling.</summary>
    internal static void AssertTiles(IReadOnlyList<PageBox> boxes, float width, float height)
    {
        var area = 0.0;
        foreach (var box in boxes)
        {
            Assert.True(box.Left >= -1e-3 && box.Bottom >= -1e-3 && box.Right <= width + 1e-3 && box.Top <= height + 1e-3, $"{box} leaves the page");
            Assert.True(box.Width > 0 && box.Height > 0, $"{box} is empty");
            area += box.Width * (double)box.Height;
        }

        for (var i = 0; i < boxes.Count; i++)
        {
            for (var j = i + 1; j < boxes.Count; j++)
            {
                var overlapX = Math.Min(boxes[i].Right, boxes[j].Right) - Math.Max(boxes[i].Left, boxes[j].Left);
                var overlapY = Math.Min(boxes[i].Top, boxes[j].Top) - Math.Max(boxes[i].Bottom, boxes[j].Bottom);
                Assert.False(overlapX > 1e-3 && overlapY > 1e-3, $"{boxes[i]} overlaps {boxes[j]}");
            }
        }

        Assert.Equal(width * (double)height, area, width * height * 1e-5);
    }

    private static float[] Fill(RasterImage raster, int width, int height, string fit)
    {
        var preprocessor = new PageImagePreprocessor(width, height, fit, Mean, Std);
        var input = new float[3 * width * height];
        preprocessor.Fill(raster, preprocessor.Place(raster), input);
        return input;
    }

    private static float Normalised(double value, int channel) => (float)(((value / 255) - Mean[channel]) / Std[channel]);

    private sealed class BoxComparer : IEqualityComparer<PageBox>
    {
        public static readonly BoxComparer Instance = new();

        public bool Equals(PageBox x, PageBox y) =>
            Math.Abs(x.Left - y.Left) < 1e-3 && Math.Abs(x.Bottom - y.Bottom) < 1e-3 && Math.Abs(x.Right - y.Right) < 1e-3 && Math.Abs(x.Top - y.Top) < 1e-3;

        public int GetHashCode(PageBox obj) => 0;
    }
}
