using System.Globalization;
using System.Text.RegularExpressions;
using IndexKeeper.Core.Documents.Tools;

namespace IndexKeeper.Core.Documents.Ocr;

/// <summary>
/// Gives words to pages without a text layer (<see cref="OcrRule"/>): PDF pages are drawn by pdftoppm at
/// <see cref="Dpi"/> and read by Tesseract; image files are given to Tesseract as they are. Words come
/// from Tesseract's TSV output with their boxes turned into the page's coordinates. Results are kept in
/// the <see cref="OcrCache"/> when one is configured.
/// </summary>
internal sealed partial class PageOcr(ReaderSettings settings)
{
    /// <summary>Resolution pages are drawn at for OCR: Tesseract's documentation recommends at least 300 dpi.</summary>
    public const int Dpi = 300;

    public const string Package = "tesseract-ocr with the language packs tesseract-ocr-LANG";

    /// <summary>Fills in words of the pages of a PDF (or a converted document's PDF) that need them.</summary>
    public DocumentContent OverPdf(byte[] pdf, DocumentContent content, ReadLimits limits, CancellationToken cancellationToken)
    {
        if (!settings.Ocr || !content.Pages.Any(OcrRule.Needs))
        {
            return content;
        }

        var (tesseract, identity, cache) = Setup();
        var rasterizer = ToolVersion.Require(settings.Rasterizer, "pdftoppm", "poppler-utils", "OCR of PDF pages").Path;
        using var scratch = new ScratchDirectory();
        var input = scratch.File("document.pdf");
        File.WriteAllBytes(input, pdf);
        var pages = new List<PageContent>(content.Pages.Count);
        foreach (var page in content.Pages)
        {
            if (!OcrRule.Needs(page))
            {
                pages.Add(page);
                continue;
            }

            var words = cache?.TryGet(page.Key);
            if (words is null)
            {
                var image = scratch.File("page");
                var number = page.Number.ToString(CultureInfo.InvariantCulture);
                Run(rasterizer, ["-r", Dpi.ToString(CultureInfo.InvariantCulture), "-gray", "-cropbox", "-singlefile", "-f", number, "-l", number, input, image], limits, cancellationToken);
                var scale = 72f / Dpi;
                words = Recognise(tesseract, image + ".pgm", limits, cancellationToken)
                    .Select(w => new PageWord(w.Text, ToUserSpace(w, page, scale)))
                    .ToList();
                cache?.Put(page.Key, words);
            }

            pages.Add(Recognised(page, words, identity));
        }

        return content with { Pages = pages };
    }

    /// <summary>Fills in words of an image file's pages (one per TIFF directory), in pixels from the bottom-left.</summary>
    public DocumentContent OverImage(byte[] file, string extension, DocumentContent content, ReadLimits limits, CancellationToken cancellationToken)
    {
        if (!settings.Ocr || !content.Pages.Any(OcrRule.Needs))
        {
            return content;
        }

        var (tesseract, identity, cache) = Setup();
        var cached = content.Pages.Select(p => cache?.TryGet(p.Key)).ToList();
        if (cached.All(w => w is not null))
        {
            return content with { Pages = content.Pages.Select((p, i) => Recognised(p, cached[i]!, identity)).ToList() };
        }

        using var scratch = new ScratchDirectory();
        var input = scratch.File("image" + extension);
        File.WriteAllBytes(input, file);
        var byPage = Recognise(tesseract, input, limits, cancellationToken).ToLookup(w => w.Page);
        var pages = content.Pages.Select(page =>
        {
            var words = byPage[page.Number]
                .Select(w => new PageWord(w.Text, new PageBox(w.Left, page.Height - w.Top - w.Height, w.Left + w.Width, page.Height - w.Top)))
                .ToList();
            cache?.Put(page.Key, words);
            return Recognised(page, words, identity);
        }).ToList();
        return content with { Pages = pages };
    }

    /// <summary>The page with OCR's words when they are better than its text layer's, keyed anew for them (<see cref="RecognisedPageKey"/>).</summary>
    private static PageContent Recognised(PageContent page, IReadOnlyList<PageWord> recognised, string identity)
    {
        var better = OcrRule.Better(page.Words, recognised);
        return ReferenceEquals(better, page.Words) ? page : page with { Words = better, Key = RecognisedPageKey.Of(identity, page.Key) };
    }

    private ((string Path, string Version) Tesseract, string Identity, OcrCache? Cache) Setup()
    {
        var tesseract = ToolVersion.Require(settings.OcrProgram, "tesseract", Package, "OCR of pages without a text layer");
        // What decides OCR output besides the page: the program's version, the languages, the resolution.
        var identity = tesseract.Version + "; " + Languages() + "; " + Dpi.ToString(CultureInfo.InvariantCulture) + " dpi";
        return (tesseract, identity, settings.OcrCacheDirectory is { } directory ? new OcrCache(directory, identity) : null);
    }

    private string Languages() => string.Join('+', settings.OcrLanguages);

    private IEnumerable<TesseractTsv.Word> Recognise((string Path, string Version) tesseract, string image, ReadLimits limits, CancellationToken cancellationToken)
    {
        // One thread: the machine's cores belong to the encoder and to other reads (Tesseract's OpenMP
        // threads cost more than they give on small machines, common practice of its users).
        var run = Run(
            tesseract.Path,
            [image, "stdout", "--dpi", Dpi.ToString(CultureInfo.InvariantCulture), "-l", Languages(), "tsv"],
            limits,
            cancellationToken,
            new Dictionary<string, string> { ["OMP_THREAD_LIMIT"] = "1" });
        try
        {
            return TesseractTsv.Parse(run.OutputText).ToList();
        }
        catch (FormatException e)
        {
            throw new DocumentReadException(QuarantineReason.ConversionFailed, "Tesseract's output cannot be read: " + e.Message, e);
        }
    }

    private ToolRun Run(string program, string[] arguments, ReadLimits limits, CancellationToken cancellationToken, IReadOnlyDictionary<string, string>? environment = null)
    {
        var timeout = limits.ReadTimeout > TimeSpan.Zero && limits.ReadTimeout < settings.OcrPageTimeout ? limits.ReadTimeout : settings.OcrPageTimeout;
        ToolRun run;
        try
        {
            run = ToolRunner.Run(program, arguments, timeout, null, 64L << 20, cancellationToken, environment);
        }
        catch (TimeoutException e)
        {
            throw new DocumentReadException(QuarantineReason.ReadTimeout, "OCR did not finish: " + e.Message, e);
        }

        // With several languages Tesseract goes on without a missing one and exits 0: still not what was configured.
        if (MissingLanguage().Match(run.Error) is { Success: true } missing)
        {
            throw new DocumentReadException(
                QuarantineReason.ToolMissing,
                $"OCR needs the Tesseract language '{missing.Groups[1].Value}', which is not installed (Debian package {LanguagePackage(missing.Groups[1].Value)})");
        }

        if (run.ExitCode != 0)
        {
            throw new DocumentReadException(
                QuarantineReason.ConversionFailed,
                $"{Path.GetFileName(program)} failed (exit code {run.ExitCode}): {run.ErrorHead}");
        }

        return run;
    }

    /// <summary>Debian's package of a Tesseract language: <c>chi_sim</c> is in tesseract-ocr-chi-sim; script models are in tesseract-ocr-script-*.</summary>
    private static string LanguagePackage(string language) =>
        language.StartsWith("script/", StringComparison.Ordinal)
            ? "tesseract-ocr-script-* for " + language
            : "tesseract-ocr-" + language.ToLowerInvariant().Replace('_', '-');

    /// <summary>
    /// A box in pixels of the drawn page (top-left origin, the page's /Rotate applied, as pdftoppm draws)
    /// to unrotated user space from the visible box's lower-left corner, as PDF words are.
    /// </summary>
    internal static PageBox ToUserSpace(TesseractTsv.Word word, PageContent page, float scale)
    {
        var (u1, v1) = (word.Left * scale, word.Top * scale);
        var (u2, v2) = ((word.Left + word.Width) * scale, (word.Top + word.Height) * scale);
        (float X, float Y) Point(float u, float v) => page.Rotation switch
        {
            90 => (v, u),
            180 => (page.Width - u, v),
            270 => (page.Width - v, page.Height - u),
            _ => (u, page.Height - v),
        };
        var a = Point(u1, v1);
        var b = Point(u2, v2);
        return new PageBox(Math.Min(a.X, b.X), Math.Min(a.Y, b.Y), Math.Max(a.X, b.X), Math.Max(a.Y, b.Y));
    }

    // What Tesseract 5 writes to stderr when a language's traineddata file is absent (seen with 5.3.0).
    [GeneratedRegex("Failed loading language '([^']+)'")]
    private static partial Regex MissingLanguage();
}
