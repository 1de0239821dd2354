namespace IndexKeeper.Core.Documents;

/// <summary>Tells a document's kind from its first bytes; the file name's extension is never trusted.</summary>
internal static class SignatureSniffer
{
    /// <summary>How far into the file a PDF header may start.</summary>
    public const int PdfHeaderWindow = 1024;

    public static DocumentKind Sniff(ReadOnlySpan<byte> head)
    {
        // PNG specification §5.2: the eight-byte signature 89 50 4E 47 0D 0A 1A 0A.
        if (head.StartsWith((ReadOnlySpan<byte>)[0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A]))
        {
            return DocumentKind.Png;
        }

        // ITU-T T.81 §B.1.1.3: SOI (FF D8) followed by the next marker's FF.
        if (head.StartsWith((ReadOnlySpan<byte>)[0xFF, 0xD8, 0xFF]))
        {
            return DocumentKind.Jpeg;
        }

        // TIFF 6.0 §2: "II" and 42 little-endian, or "MM" and 42 big-endian (43 is BigTIFF).
        if (head.StartsWith("II*\0"u8) || head.StartsWith("MM\0*"u8) || head.StartsWith("II+\0"u8) || head.StartsWith("MM\0+"u8))
        {
            return DocumentKind.Tiff;
        }

        // ISO 32000-1 §7.5.2 puts "%PDF-" on the first line; readers accept it anywhere in the first
        // 1024 bytes because some producers put junk before it (common practice).
        var window = head[..Math.Min(head.Length, PdfHeaderWindow)];
        return window.IndexOf("%PDF-"u8) >= 0 ? DocumentKind.Pdf : DocumentKind.Unknown;
    }
}
