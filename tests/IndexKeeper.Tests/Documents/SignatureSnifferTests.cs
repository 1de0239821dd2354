using IndexKeeper.Core.Documents;

namespace IndexKeeper.Tests.Documents;

/// <summary>Signatures as the format specifications define them; the file name never decides.</summary>
public sealed class SignatureSnifferTests : IDisposable
{
    private readonly TempFolder folder = new();

    [Theory]
    [InlineData("89504E470D0A1A0A0000000D", DocumentKind.Png)] // PNG specification §5.2
    [InlineData("FFD8FFE000104A464946", DocumentKind.Jpeg)] // ITU-T T.81 §B.1.1.3 SOI then APP0
    [InlineData("49492A0008000000", DocumentKind.Tiff)] // TIFF 6.0 §2, little-endian
    [InlineData("4D4D002A00000008", DocumentKind.Tiff)] // TIFF 6.0 §2, big-endian
    [InlineData("255044462D312E370A", DocumentKind.Pdf)] // ISO 32000-1 §7.5.2 "%PDF-1.7"
    [InlineData("0D0A255044462D312E34", DocumentKind.Pdf)] // junk before the header (common practice)
    [InlineData("504B0304", DocumentKind.Unknown)] // a ZIP archive
    [InlineData("", DocumentKind.Unknown)]
    public void Sniff_names_the_kind(string hex, DocumentKind kind) =>
        Assert.Equal(kind, SignatureSniffer.Sniff(Convert.FromHexString(hex)));

    [Fact]
    public void A_header_past_the_first_1024_bytes_is_not_a_pdf()
    {
        var late = new byte[SignatureSniffer.PdfHeaderWindow].Concat("%PDF-1.7"u8.ToArray()).ToArray();
        Assert.Equal(DocumentKind.Unknown, SignatureSniffer.Sniff(late));
    }

    [Fact]
    public void A_pdf_named_png_and_a_png_named_pdf_are_read_by_their_signatures()
    {
        var pdfPath = folder.Write("misnamed.png", SampleDocuments.Builder(1));
        var pngPath = folder.Write("misnamed.pdf", SampleDocuments.Png(4, 4, 9));
        var reader = DocumentReaderFactory.Create();
        Assert.Equal(DocumentKind.Pdf, reader.Read(pdfPath, ReadLimits.Default, CancellationToken.None).Kind);
        Assert.Equal(DocumentKind.Png, reader.Read(pngPath, ReadLimits.Default, CancellationToken.None).Kind);
    }

    public void Dispose() => folder.Dispose();
}
