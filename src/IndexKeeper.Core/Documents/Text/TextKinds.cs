namespace IndexKeeper.Core.Documents.Text;

/// <summary>
/// Kinds of file that have no signature bytes, told by the extension of their name (case ignored):
/// the one place where a name decides, documented in docs/readers.md.
/// </summary>
internal static class TextKinds
{
    public static DocumentKind ByName(string name) => Path.GetExtension(name).ToLowerInvariant() switch
    {
        ".txt" or ".text" => DocumentKind.PlainText,
        ".md" or ".markdown" => DocumentKind.Markdown,
        ".html" or ".htm" => DocumentKind.Html,
        ".eml" => DocumentKind.Email,
        _ => DocumentKind.Unknown,
    };
}
