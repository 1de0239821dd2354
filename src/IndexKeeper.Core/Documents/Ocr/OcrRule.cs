namespace IndexKeeper.Core.Documents.Ocr;

/// <summary>
/// Which pages are read by OCR (docs/readers.md, "OCR"): those whose text layer holds fewer than
/// <see cref="MinimumTextLayerLetters"/> letters and digits — none at all (a scan, a photo) or nearly
/// none (a scan with a stamped page number or a short header). Text pages never need it.
/// </summary>
internal static class OcrRule
{
    public const int MinimumTextLayerLetters = 20;

    public static bool Needs(PageContent page) =>
        page.Words.Sum(w => w.Text.Count(char.IsLetterOrDigit)) < MinimumTextLayerLetters;
}
