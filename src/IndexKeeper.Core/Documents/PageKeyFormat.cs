namespace IndexKeeper.Core.Documents;

/// <summary>
/// Constants of the canonical page form that page keys hash (spec: docs/page-keys.md). The version is
/// part of the hashed bytes, so a change of the canonical form yields new keys instead of false matches.
/// </summary>
internal static class PageKeyFormat
{
    /// <summary>Canonical form version; must equal the version in docs/page-keys.md. Never reuse a number.</summary>
    public const uint Version = 1;

    /// <summary>Leads every canonical page form: 8 ASCII bytes, never change.</summary>
    public static ReadOnlySpan<byte> Magic => "IKPAGE\r\n"u8;

    /// <summary>Kind byte after the version: what sort of page the rest describes. Never change.</summary>
    public const byte PdfPage = (byte)'P';

    /// <summary>A page of decoded pixels (PNG, JPEG, TIFF frame). Never change.</summary>
    public const byte PixelPage = (byte)'X';

    /// <summary>A PDF page a converter drew from another format, salted with the converter's version. Never change.</summary>
    public const byte ConvertedPage = (byte)'C';

    /// <summary>A page whose words came from OCR, salted with the OCR identity. Never change.</summary>
    public const byte RecognisedPage = (byte)'O';

    /// <summary>A page of text laid out by the text page rule (plain text, Markdown, HTML, e-mail). Never change.</summary>
    public const byte TextPage = (byte)'T';
}
