namespace IndexKeeper.Core.Documents.Ocr;

/// <summary>
/// Which pages are read by OCR (docs/readers.md, "OCR"): those whose text layer holds fewer than
/// <see cref="MinimumTextLayerLetters"/> letters and digits — none at all (a scan, a photo) or nearly
/// none (a scan with a stamped page number or a short header). Text pages never need it.
/// </summary>
internal static class OcrRule
{
    public const int MinimumTextLayerLetters = 20;

    public static bool Needs(PageContent page) => Letters(page.Words) < MinimumTextLayerLetters;

    /// <summary>
    /// OCR words replace a page's text-layer words only when they hold more letters and digits: a short
    /// but real text layer (a drawing's title) is exact, and OCR of it can only be worse.
    /// </summary>
    public static IReadOnlyList<PageWord> Better(IReadOnlyList<PageWord> textLayer, IReadOnlyList<PageWord> recognised) =>
        Letters(recognised) > Letters(textLayer) ? recognised : textLayer;

    private static int Letters(IEnumerable<PageWord> words) => words.Sum(w => w.Text.Count(char.IsLetterOrDigit));
}
