using IndexKeeper.Core.Documents;

namespace IndexKeeper.Core.Search;

/// <summary>
/// The page a match map is drawn over: the document file as it is now, its kind, the page's number in it
/// and its rotation (the map is drawn in the page's unrotated space, where words and regions are).
/// </summary>
public sealed record MapBackdrop(string FilePath, DocumentKind Kind, int PageNumber, int Rotation)
{
    /// <summary>Whether a map can be drawn over pages of this kind: PDFs by poppler's pdftoppm, PNG and JPEG pages decoded.</summary>
    public static bool Draws(DocumentKind kind) => kind is DocumentKind.Pdf or DocumentKind.Png or DocumentKind.Jpeg;
}
