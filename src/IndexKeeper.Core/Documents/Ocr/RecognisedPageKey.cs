namespace IndexKeeper.Core.Documents.Ocr;

/// <summary>
/// The key of a page whose words came from OCR: the OCR identity (Tesseract's version line, the languages,
/// the resolution) salts the page's own key (docs/page-keys.md, "Recognised pages"). Text encoders see those
/// words, so an index whose vectors were made from no words (read before OCR, or with OCR off) or from
/// another Tesseract gets a new key and new vectors instead of old ones under an unchanged key.
/// </summary>
internal static class RecognisedPageKey
{
    public static PageKey Of(string ocrIdentity, PageKey pageKey) =>
        SaltedPageKey.Of(PageKeyFormat.RecognisedPage, ocrIdentity, pageKey);
}
