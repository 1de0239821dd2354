using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Encoding.PageImages;
using IndexKeeper.Tests.Documents;
using SixLabors.ImageSharp;
using SixLabors.ImageSharp.PixelFormats;

namespace IndexKeeper.Tests.Encoding.PageImages;

/// <summary>
/// The whole page-image path for real — poppler's pdftoppm draws, the pre-processing fits, ONNX Runtime runs
/// the tests' own graphs, the vectors are normalised and placed — checked against a plain C# reference of the
/// convolution (ONNX operator specification, Conv) and against the page geometry.
/// </summary>
public sealed class PageImageEncoderTests(PageImageModels models) : IClassFixture<PageImageModels>
{
    [Fact]
    public void A_drawn_pdf_gives_unit_vectors_for_the_patches_on_each_page_with_regions_tiling_it()
    {
        using var folder = new TempFolder();
        (int Width, int Height, int Rotate)[] shapes = [(800, 200, 0), (300, 400, 0), (600, 400, 90)];
        var pdf = folder.Write("manual.pdf", TestPdfs.Pages(shapes.Select(s => (s.Width, s.Height, s.Rotate, "0 0 0 rg 40 40 100 60 re f")).ToArray()));
        using var encoder = Create(models.Options());
        var pages = shapes.Select((s, i) => Page(pdf, i + 1, s.Width, s.Height, s.Rotate)).ToArray();

        var sets = encoder.EncodePages(pages, CancellationToken.None);

        Assert.Equal(3, sets.Count);
        for (var p = 0; p < shapes.Length; p++)
        {
            var (width, height, rotate) = shapes[p];
            var quarter = rotate is 90 or 270;
            Assert.Equal(ExpectedPatches(quarter ? height : width, quarter ? width : height), sets[p].Count);
            Assert.Equal(PageImageModels.Dimensions, sets[p].Dimensions);
            AssertUnitRows(sets[p]);
            PageImagePreprocessorTests.AssertTiles(sets[p].Regions, width, height);
        }

        // 800×200 at 72 dpi fills input rows 64 to 96 of 160: one row of four patches.
        Assert.Equal(4, sets[0].Count);
    }

    [Fact]
    public void A_known_image_gives_the_vectors_of_the_reference_convolution()
    {
        using var folder = new TempFolder();
        var pixels = Pattern(PageImageModels.Width, PageImageModels.Height);
        var png = folder.Write("scan.png", Png(PageImageModels.Width, PageImageModels.Height, pixels));
        var options = models.Options();
        using var encoder = Create(options);

        var set = encoder.EncodePages([Page(png, 1, PageImageModels.Width, PageImageModels.Height, 0)], CancellationToken.None)[0];

        // The image is exactly the input size, so pre-processing is only (v / 255 − mean) / std per channel, planar.
        var input = Normalise(pixels, options);

        var expected = models.ReferencePatchVectors(input);
        Assert.Equal(expected.Length, set.Vectors.Length);
        Assert.Equal(expected, set.Vectors, new Tolerance(1e-4f));

        // Patch 0 is the top-left 32×32 pixels: in page coordinates (origin bottom left) x 0..32, y 128..160.
        Assert.Equal(new PageBox(0, 128, 32, 160), set.Regions[0]);
    }

    [Fact]
    public void Pages_of_a_multi_page_tiff_are_decoded_directly_and_a_turned_page_is_drawn_as_shown()
    {
        using var folder = new TempFolder();
        // Two pages stored 160×128 (the image library reads TIFFs whose pages share one size, as the document reader does).
        var first = Pattern(PageImageModels.Height, PageImageModels.Width);
        var second = Pattern(PageImageModels.Height, PageImageModels.Width).Select(b => (byte)(255 - b)).ToArray();
        var tiff = folder.Write("scans.tif", TiffWriter.Rgb([(PageImageModels.Height, PageImageModels.Width, first), (PageImageModels.Height, PageImageModels.Width, second)]));
        using var encoder = Create(models.Options());

        // Page 1 is shown as stored (letterboxed: 128×102.4 at input rows 28.8 to 131.2, still all five patch rows);
        // page 2 is shown turned a quarter clockwise (as TIFF orientation 6), so it fills the 128×160 input.
        var sets = encoder.EncodePages(
            [Page(tiff, 1, PageImageModels.Height, PageImageModels.Width, 0), Page(tiff, 2, PageImageModels.Height, PageImageModels.Width, 90)],
            CancellationToken.None);

        Assert.Equal(20, sets[0].Count);
        Assert.Equal(20, sets[1].Count);
        PageImagePreprocessorTests.AssertTiles(sets[0].Regions, PageImageModels.Height, PageImageModels.Width);
        PageImagePreprocessorTests.AssertTiles(sets[1].Regions, PageImageModels.Height, PageImageModels.Width);

        // The stored page 2 turned clockwise is an image of the input's size: the reference convolution of it is what the graph gave.
        var turned = new Core.Encoding.PageImages.RasterImage(PageImageModels.Height, PageImageModels.Width, 3, second).RotateClockwise(90);
        Assert.Equal(models.ReferencePatchVectors(Normalise(turned.Pixels, models.Options())), sets[1].Vectors, new Tolerance(1e-4f));

        // Turned clockwise, the stored bottom-left corner shows at the top left: patch 0 covers it.
        Assert.Equal(new PageBox(0, 0, 32, 32), sets[1].Regions[0]);
    }

    [Fact]
    public void Two_encoders_on_the_same_files_give_the_same_floats()
    {
        using var folder = new TempFolder();
        var pdf = folder.Write("report.pdf", TestPdfs.Page(420, 595, 0, "0.1 0.4 0.7 rg 30 300 200 150 re f"));
        using var first = Create(models.Options());
        using var second = Create(models.Options());

        var a = first.EncodePages([Page(pdf, 1, 420, 595, 0)], CancellationToken.None)[0];
        var b = second.EncodePages([Page(pdf, 1, 420, 595, 0)], CancellationToken.None)[0];

        Assert.Equal(a.Vectors, b.Vectors);
        Assert.Equal(first.Identity, second.Identity);
    }

    [Fact]
    public void A_query_gives_the_normalised_table_rows_of_its_word_pieces()
    {
        using var encoder = Create(models.Options());

        var set = encoder.EncodeQuery("Pump stations", CancellationToken.None);

        // Ids are line numbers of our vocabulary: [CLS] 2, pump 5, station 6, ##s 12, [SEP] 3 (WordPiece, longest match first).
        int[] ids = [2, 5, 6, 12, 3];
        Assert.Equal(ids, encoder.TokenIds("Pump stations"));
        Assert.Equal(ids.Length, set.Count);
        for (var t = 0; t < ids.Length; t++)
        {
            var row = models.Table.AsSpan(ids[t] * PageImageModels.Dimensions, PageImageModels.Dimensions).ToArray();
            var norm = MathF.Sqrt(row.Sum(v => v * v));
            Assert.Equal(row.Select(v => v / norm), set.Row(t).ToArray(), new Tolerance(1e-6f));
        }
    }

    [Fact]
    public void A_long_query_is_cut_keeping_the_separator_last()
    {
        var options = models.Options();
        options.QueryMaxTokens = 3;
        using var encoder = Create(options);

        Assert.Equal(new[] { 2, 5, 3 }, encoder.TokenIds("pump valve main"));
        Assert.Equal(3, encoder.EncodeQuery("pump valve main", CancellationToken.None).Count);
    }

    [Fact]
    public void A_pdf_that_pdftoppm_cannot_draw_fails_the_batch_with_its_message()
    {
        using var folder = new TempFolder();
        var broken = folder.Write("broken.pdf", "%PDF-1.7\nnot a document\n"u8.ToArray());
        using var encoder = Create(models.Options());

        var error = Assert.Throws<InvalidOperationException>(() => encoder.EncodePages([Page(broken, 1, 612, 792, 0)], CancellationToken.None));
        Assert.Contains("pdftoppm could not draw pages 1-1", error.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void A_cancelled_batch_stops_with_cancellation()
    {
        using var folder = new TempFolder();
        var pdf = folder.Write("long.pdf", TestPdfs.Pages(Enumerable.Range(0, 6).Select(_ => (612, 792, 0, "0 0 1 rg 10 10 50 50 re f")).ToArray()));
        using var encoder = Create(models.Options());
        using var cancelled = new CancellationTokenSource();
        cancelled.Cancel();

        Assert.ThrowsAny<OperationCanceledException>(() => encoder.EncodePages(Enumerable.Range(1, 6).Select(n => Page(pdf, n, 612, 792, 0)).ToArray(), cancelled.Token));
    }

    [Fact]
    public void A_file_gone_since_it_was_queued_fails_the_batch_not_the_pass()
    {
        using var encoder = Create(models.Options());
        var gone = Path.Combine(models.Folder, "gone.pdf");

        // InvalidOperationException leaves the batch queued; an IOException would stop the whole embed pass.
        var error = Assert.Throws<InvalidOperationException>(() => encoder.EncodePages([Page(gone, 1, 612, 792, 0)], CancellationToken.None));
        Assert.Contains(gone, error.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Missing_pdftoppm_and_model_files_are_named_before_any_page()
    {
        var options = models.Options();
        options.Pdftoppm = "/nonexistent/poppler/pdftoppm";
        options.PageModel = Path.Combine(models.Folder, "missing.onnx");
        options.PixelStd = [0.5, 0.5];

        var error = Assert.Throws<ArgumentException>(() => PageImageEncoderFactory.Create(options));

        Assert.Contains("Pdftoppm: '/nonexistent/poppler/pdftoppm' is not found", error.Message, StringComparison.Ordinal);
        Assert.Contains("PageModel: the file", error.Message, StringComparison.Ordinal);
        Assert.Contains("PixelStd: give 3 values (R, G, B), got 2.", error.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void A_program_that_is_not_pdftoppm_is_refused_at_creation()
    {
        var options = models.Options();
        options.Pdftoppm = "true"; // coreutils' true: on PATH, answers nothing

        var error = Assert.Throws<InvalidOperationException>(() => PageImageEncoderFactory.Create(options));

        Assert.StartsWith("Pdftoppm: 'true' cannot be used to draw pages", error.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Tensor_names_and_widths_the_graphs_lack_are_named()
    {
        var options = models.Options();
        options.PageInput = "image";
        var wrongName = Assert.Throws<InvalidOperationException>(() => Create(options));
        Assert.StartsWith("PageInput: the PageModel graph has no input 'image'; it has 'pixels'.", wrongName.Message, StringComparison.Ordinal);

        options = models.Options();
        options.Dimensions = 192;
        var wrongWidth = Assert.Throws<InvalidOperationException>(() => Create(options));
        Assert.StartsWith("PageModel: its output 'patch_vectors' has shape [1, 20, 128]", wrongWidth.Message, StringComparison.Ordinal);
    }

    private static PageImageEncoder Create(PageImageEncoderOptions options) => (PageImageEncoder)PageImageEncoderFactory.Create(options);

    private static PageToEncode Page(string path, int number, float width, float height, int rotation) =>
        new(PageKey.Of(System.Text.Encoding.UTF8.GetBytes($"{path}#{number}")), path, number, width, height, []) { Rotation = rotation };

    /// <summary>Patches of the 128×160 input in 32-pixel squares that overlap a page of w×h pixels fitted by letterbox.</summary>
    private static int ExpectedPatches(int width, int height)
    {
        var scale = Math.Min(128.0 / width, 160.0 / height);
        var (contentWidth, contentHeight) = (width * scale, height * scale);
        var (left, top) = ((128 - contentWidth) / 2, (160 - contentHeight) / 2);
        var columns = Enumerable.Range(0, 4).Count(c => c * 32 < left + contentWidth && (c + 1) * 32 > left);
        var rows = Enumerable.Range(0, 5).Count(r => r * 32 < top + contentHeight && (r + 1) * 32 > top);
        return columns * rows;
    }

    private static float[] Normalise(byte[] rgb, PageImageEncoderOptions options)
    {
        var plane = rgb.Length / 3;
        var input = new float[rgb.Length];
        for (var i = 0; i < plane; i++)
        {
            for (var c = 0; c < 3; c++)
            {
                input[(c * plane) + i] = (float)(((rgb[(i * 3) + c] / 255.0) - options.PixelMean[c]) / options.PixelStd[c]);
            }
        }

        return input;
    }

    private static void AssertUnitRows(VectorSet set)
    {
        for (var i = 0; i < set.Count; i++)
        {
            var squares = 0.0;
            foreach (var v in set.Row(i))
            {
                squares += v * (double)v;
            }

            Assert.Equal(1.0, Math.Sqrt(squares), 1e-5);
        }
    }

    // RGB bytes of a deterministic pattern with edges and gradients, so every patch differs.
    private static byte[] Pattern(int width, int height)
    {
        var pixels = new byte[width * height * 3];
        for (var y = 0; y < height; y++)
        {
            for (var x = 0; x < width; x++)
            {
                var at = ((y * width) + x) * 3;
                pixels[at] = (byte)(x * 2);
                pixels[at + 1] = (byte)((y * 3) + (x / 16 * 20));
                pixels[at + 2] = (byte)(((x / 8) + (y / 8)) % 2 == 0 ? 230 : 20);
            }
        }

        return pixels;
    }

    private static byte[] Png(int width, int height, byte[] rgb)
    {
        using var image = Image.LoadPixelData<Rgb24>(rgb, width, height);
        using var output = new MemoryStream();
        image.SaveAsPng(output);
        return output.ToArray();
    }
}
