namespace IndexKeeper.Core.Documents.Office;

/// <summary>
/// The key of a page that a converter drew: the converter's version salts the key of the PDF page it made
/// (docs/page-keys.md, "Converted pages"), so a converter upgrade that may draw differently yields new
/// keys, planned as re-work, instead of vectors of old renderings under unchanged keys.
/// </summary>
internal static class ConvertedPageKey
{
    public static PageKey Of(string converterVersion, PageKey pdfPageKey) =>
        SaltedPageKey.Of(PageKeyFormat.ConvertedPage, converterVersion, pdfPageKey);
}
