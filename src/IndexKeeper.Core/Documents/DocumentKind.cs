namespace IndexKeeper.Core.Documents;

/// <summary>Kinds of document the reader understands. Numbers reach the catalog: never change them.</summary>
public enum DocumentKind
{
    Unknown = 0,
    Pdf = 1,
    Png = 2,
    Jpeg = 3,
    Tiff = 4,
}
