namespace IndexKeeper.Core.Documents;

/// <summary>
/// A page key salted with what made the page's content besides the file (docs/page-keys.md): the kind byte
/// says which maker, the salt names its version, and the page's own key follows. Converted pages
/// (<see cref="PageKeyFormat.ConvertedPage"/>) and recognised pages (<see cref="PageKeyFormat.RecognisedPage"/>).
/// </summary>
internal static class SaltedPageKey
{
    public static PageKey Of(byte kind, string salt, PageKey pageKey)
    {
        var writer = new Pdf.CanonicalWriter();
        writer.Raw(PageKeyFormat.Magic);
        writer.UInt32(PageKeyFormat.Version);
        writer.Byte(kind);
        writer.String(System.Text.Encoding.UTF8.GetBytes(salt));
        writer.Hash(pageKey.ToBytes());
        return PageKey.Of(writer.WrittenSpan);
    }
}
