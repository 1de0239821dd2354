using System.Text.RegularExpressions;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Documents.Ocr;
using IndexKeeper.Tests.Demo;
using IndexKeeper.Tests.Documents;
using SkiaSharp;

namespace IndexKeeper.Tests.Readers;

public sealed partial class OcrTests : IDisposable
{
    /// <summary>
    /// A real text PDF from outside the project: the GNU Libtasn1 manual that Debian's libtasn1-doc package
    /// ships (installed by ./install). Its own text layer, extracted by poppler's pdftotext, is the reference.
    /// </summary>
    private const string DebianManual = "/usr/share/doc/libtasn1-doc/libtasn1.pdf";

    private const int ManualPage = 5;

    private readonly TempFolder folder = new();

    [Fact]
    public void A_scanned_page_is_read_with_95_percent_word_recall_against_its_text_layer()
    {
        // The page drawn at 300 dpi by poppler's pdftoppm, then wrapped into an image-only PDF (SkiaSharp):
        // the reader sees a page without a text layer and must OCR it.
        var prefix = folder.PathOf("scan");
        var page = ManualPage.ToString(System.Globalization.CultureInfo.InvariantCulture);
        Assert.Equal(0, ExternalTool.Run("pdftoppm", "-r", "300", "-png", "-singlefile", "-f", page, "-l", page, DebianManual, prefix).ExitCode);
        var scanned = ImageOnlyPdf(File.ReadAllBytes(prefix + ".png"));

        var content = DocumentReaderFactory.Create().Read(folder.Write("scan.pdf", scanned), ReadLimits.Default, CancellationToken.None);

        var (_, reference) = ExternalTool.Run("pdftotext", "-f", page, "-l", page, DebianManual, "-");
        var expected = Words(reference);
        var recognised = Words(string.Join(' ', content.Pages[0].Words.Select(w => w.Text)));
        Assert.True(expected.Count > 100, $"page {ManualPage} of the manual has only {expected.Count} words");
        var found = expected.Count(w => recognised.Remove(w));
        var recall = (double)found / expected.Count;
        Assert.True(recall >= 0.95, $"word recall {recall:P1} ({found} of {expected.Count})");

        // Boxes are in the page's user space (A4-like points), inside the page.
        Assert.All(content.Pages[0].Words, w =>
        {
            Assert.InRange(w.Box.Left, 0, content.Pages[0].Width);
            Assert.InRange(w.Box.Top, 0, content.Pages[0].Height);
            Assert.True(w.Box.Right > w.Box.Left && w.Box.Top > w.Box.Bottom);
        });
    }

    [Fact]
    public void A_png_scan_gets_words_in_pixels_and_the_cache_keeps_them()
    {
        var cache = folder.PathOf("ocr-cache");
        var reader = DocumentReaderFactory.Create(ReaderSettings.Default with { OcrCacheDirectory = cache });
        var png = Render("Kellmarsh harbour dredging notice");
        var content = reader.Read(folder.Write("notice.png", png), ReadLimits.Default, CancellationToken.None);
        Assert.Equal(["Kellmarsh", "harbour", "dredging", "notice"], content.Pages[0].Words.Select(w => w.Text));
        Assert.All(content.Pages[0].Words, w => Assert.InRange(w.Box.Bottom, 0, 200));
        Assert.Single(Directory.GetFiles(cache, "*.words", SearchOption.AllDirectories));

        var again = reader.Read(folder.Write("copy.png", png), ReadLimits.Default, CancellationToken.None);
        Assert.Equal(content.Pages[0].Words, again.Pages[0].Words);
    }

    [Fact]
    public void Ocr_off_leaves_scans_without_words()
    {
        var reader = DocumentReaderFactory.Create(ReaderSettings.Default with { Ocr = false });
        var content = reader.Read(folder.Write("notice.png", Render("dredging")), ReadLimits.Default, CancellationToken.None);
        Assert.Empty(content.Pages[0].Words);
    }

    [Fact]
    public void A_missing_ocr_program_quarantines_with_the_package_name()
    {
        var reader = DocumentReaderFactory.Create(ReaderSettings.Default with { OcrProgram = "/nonexistent/tesseract" });
        var failure = Assert.Throws<DocumentReadException>(() => reader.Read(folder.Write("notice.png", Render("dredging")), ReadLimits.Default, CancellationToken.None));
        Assert.Equal(QuarantineReason.ToolMissing, failure.Reason);
        Assert.Contains("tesseract-ocr", failure.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void A_missing_language_pack_quarantines_with_its_package_name()
    {
        // "zzz" names no Tesseract language, so its traineddata file is absent on every machine.
        var reader = DocumentReaderFactory.Create(ReaderSettings.Default with { OcrLanguages = ["eng", "zzz"] });
        var failure = Assert.Throws<DocumentReadException>(() => reader.Read(folder.Write("notice.png", Render("dredging")), ReadLimits.Default, CancellationToken.None));
        Assert.Equal(QuarantineReason.ToolMissing, failure.Reason);
        Assert.Contains("'zzz'", failure.Message, StringComparison.Ordinal);
        Assert.Contains("tesseract-ocr-zzz", failure.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void The_cache_format_round_trips_and_a_damaged_file_is_a_miss()
    {
        IReadOnlyList<PageWord> words = [new("quay", new PageBox(1, 2, 3, 4)), new("berth", new PageBox(5.5f, 6, 7, 8))];
        var bytes = OcrCache.Encode(words);
        Assert.Equal(words, OcrCache.Decode(bytes));
        bytes[12] ^= 1;
        Assert.Null(OcrCache.Decode(bytes));
    }

    [Fact]
    public void Tesseract_tsv_rows_of_level_5_are_words()
    {
        // Column layout of Tesseract's TSV output (tesseract(1), "tsv" config; from memory of its output).
        const string tsv = "level\tpage_num\tblock_num\tpar_num\tline_num\tword_num\tleft\ttop\twidth\theight\tconf\ttext\n"
            + "1\t1\t0\t0\t0\t0\t0\t0\t800\t600\t-1\t\n"
            + "5\t1\t1\t1\t1\t1\t10\t20\t30\t40\t96.5\tquay\n"
            + "5\t1\t1\t1\t1\t2\t50\t20\t30\t40\t95\t \n";
        var word = Assert.Single(TesseractTsv.Parse(tsv));
        Assert.Equal(new TesseractTsv.Word(1, "quay", 10, 20, 30, 40), word);
        Assert.Throws<FormatException>(() => TesseractTsv.Parse("no header").ToList());
    }

    public void Dispose() => folder.Dispose();

    /// <summary>Words for recall: lower case, letters and digits only, tokens of at least 2 characters.</summary>
    private static List<string> Words(string text) =>
        Token().Matches(text.ToLowerInvariant()).Select(m => m.Value).Where(w => w.Length >= 2).ToList();

    private static byte[] ImageOnlyPdf(byte[] png)
    {
        using var bitmap = SKBitmap.Decode(png);
        using var stream = new MemoryStream();
        using (var document = SKDocument.CreatePdf(stream))
        {
            var width = bitmap.Width * 72f / 300;
            var height = bitmap.Height * 72f / 300;
            var canvas = document.BeginPage(width, height);
            canvas.DrawBitmap(bitmap, new SKRect(0, 0, width, height));
            document.EndPage();
        }

        return stream.ToArray();
    }

    internal static byte[] Render(string text)
    {
        using var surface = SKSurface.Create(new SKImageInfo(900, 200));
        surface.Canvas.Clear(SKColors.White);
        using var font = new SKFont(SKTypeface.Default, 48);
        using var paint = new SKPaint { Color = SKColors.Black, IsAntialias = true };
        surface.Canvas.DrawText(text, 30, 110, font, paint);
        using var image = surface.Snapshot();
        using var data = image.Encode(SKEncodedImageFormat.Png, 100);
        return data.ToArray();
    }

    [GeneratedRegex(@"[\p{L}\p{N}]+")]
    private static partial Regex Token();
}
