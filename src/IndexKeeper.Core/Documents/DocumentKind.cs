namespace IndexKeeper.Core.Documents;

/// <summary>Kinds of document the reader understands. Numbers reach the catalog: never change them.</summary>
public enum DocumentKind
{
    Unknown = 0,
    Pdf = 1,
    Png = 2,
    Jpeg = 3,
    Tiff = 4,

    /// <summary>Office Open XML (.docx, .xlsx, .pptx), converted to PDF pages by LibreOffice.</summary>
    OfficeOpenXml = 5,

    /// <summary>OpenDocument (.odt, .ods, .odp), converted like <see cref="OfficeOpenXml"/>.</summary>
    OpenDocument = 6,

    /// <summary>Rich Text Format, converted like <see cref="OfficeOpenXml"/>.</summary>
    RichText = 7,

    /// <summary>Legacy binary office files (.doc, .xls, .ppt: OLE2 compound files), converted likewise.</summary>
    LegacyOffice = 8,

    /// <summary>Plain text, paginated by the text page rule (docs/readers.md).</summary>
    PlainText = 9,

    Markdown = 10,

    Html = 11,

    /// <summary>An e-mail message (.eml, RFC 5322 + MIME); its attachments follow as further pages.</summary>
    Email = 12,
}
