using System.Text.RegularExpressions;
using IndexKeeper.Core.Documents.Pdf;
using IndexKeeper.Core.Documents;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Documents;

/// <summary>
/// What the canonical form (docs/page-keys.md) ignores and what it keeps, on one-page documents whose
/// content is written in different but equivalent ways per ISO 32000-1 (§7.2 lexical conventions,
/// §7.3.4 strings, §7.8.2 content streams, §8.9.7 inline images, §14.6 marked content).
/// </summary>
public sealed partial class CanonicalFormTests : IDisposable
{
    private const string Reference = "BT /F1 12 Tf 72 700 Td (Harrowmere) Tj ET 0.5 g 72 600 100 50 re f";

    private readonly TempFolder folder = new();

    public static TheoryData<string, string> EquivalentContents() => new()
    {
        { "white space and comments", "BT\n\t/F1   12 Tf % font\r\n72 700 Td\n(Harrowmere)Tj ET\n0.5 g\n72 600 100 50 re\nf\n" },
        { "hex string", "BT /F1 12 Tf 72 700 Td <486172726F776D657265> Tj ET 0.5 g 72 600 100 50 re f" },
        { "octal and escaped string", "BT /F1 12 Tf 72 700 Td (\\110arrow\\155ere) Tj ET 0.5 g 72 600 100 50 re f" },
        { "number spellings", "BT /F1 12.0 Tf +72 700.000 Td (Harrowmere) Tj ET .5 g 72 600 100.0 050 re f" },
        { "outer save and restore", "q q " + Reference + " Q Q" },
        { "structure marked content", "/P << /MCID 0 >> BDC " + Reference + " EMC" },
        { "artifact marked content", "/Artifact BMC BT /F1 12 Tf 72 700 Td (Harrowmere) Tj ET EMC 0.5 g 72 600 100 50 re f" },
    };

    [Theory]
    [MemberData(nameof(EquivalentContents))]
    public void Equivalent_content_has_the_same_key(string what, string content)
    {
        Assert.False(string.IsNullOrEmpty(what));
        Assert.Equal(KeyOf(Reference), KeyOf(content));
    }

    [Fact]
    public void Stream_splitting_and_filters_do_not_count()
    {
        var plain = KeyOf(Reference);
        var split = KeyOfStreams(
            ("", Ascii("BT /F1 12 Tf 72 700")),
            ("/Filter /FlateDecode", TestEncoders.Flate(Ascii(" Td (Harrowmere) Tj ET"))),
            ("/Filter /ASCIIHexDecode", TestEncoders.AsciiHex(Ascii(" 0.5 g 72 600 100 50 re f"))));
        Assert.Equal(plain, split);
    }

    [Theory]
    [InlineData("BT /F1 12 Tf 72 700 Td (Harrowmere.) Tj ET 0.5 g 72 600 100 50 re f")]
    [InlineData("BT /F1 12 Tf 72 701 Td (Harrowmere) Tj ET 0.5 g 72 600 100 50 re f")]
    [InlineData("BT /F1 12 Tf 72 700 Td (Harrowmere) Tj ET 0.5 g 72 600 100 50 re S")]
    [InlineData("q BT /F1 12 Tf 72 700 Td (Harrowmere) Tj ET Q 0.5 g 72 600 100 50 re f")]
    [InlineData("/OC /Layer1 BDC " + Reference + " EMC")]
    public void A_different_drawing_has_a_different_key(string content) => Assert.NotEqual(KeyOf(Reference), KeyOf(content));

    [Fact]
    public void An_inline_image_and_an_image_XObject_with_the_same_pixels_have_the_same_key()
    {
        var pixels = Enumerable.Range(0, 2 * 2 * 3).Select(i => (byte)(i * 20)).ToArray();
        var inline = KeyOfStreams(("", Ascii($"q 40 0 0 30 72 560 cm BI /W 2 /H 2 /CS /RGB /BPC 8 /F /AHx ID {Convert.ToHexString(pixels)}> EI Q")));
        var unfilteredInline = KeyOfStreams(("", Ascii("q 40 0 0 30 72 560 cm BI /W 2 /H 2 /CS /RGB /BPC 8 ID ").Concat(pixels).Concat(Ascii(" EI Q")).ToArray()));
        var xObject = KeyOfStreams(
            [("", Ascii("q 40 0 0 30 72 560 cm /Im0 Do Q"))],
            image: ("/Type /XObject /Subtype /Image /Width 2 /Height 2 /ColorSpace /DeviceRGB /BitsPerComponent 8 /Filter /FlateDecode", TestEncoders.Flate(pixels)));
        Assert.Equal(xObject, inline);
        Assert.Equal(xObject, unfilteredInline);
    }

    [Fact]
    public void The_canonical_form_starts_with_magic_and_version()
    {
        var document = OnePage(Reference);
        using var pdf = UglyToad.PdfPig.PdfDocument.Open(document);
        var resolver = new PdfObjectResolver(pdf.Structure);
        var node = PdfPageTree.Collect(resolver, pdf.Structure.Catalog.CatalogDictionary, 10, CancellationToken.None).Single();
        var canonical = new PdfPageCanonicalizer(resolver, 1 << 20, CancellationToken.None).Canonicalize(node);
        Assert.Equal("IKPAGE\r\n"u8.ToArray(), canonical[..8]);
        Assert.Equal(PageKeyFormat.Version, System.Buffers.Binary.BinaryPrimitives.ReadUInt32BigEndian(canonical.AsSpan(8)));
        Assert.Equal(PageKey.Of(canonical).Hex, folder.Keys(document).Single());
    }

    [Fact]
    public void The_version_in_the_spec_matches_the_code()
    {
        var spec = File.ReadAllText(Path.Combine(RepositoryRoot.Path, "docs", "page-keys.md"));
        var match = SpecVersion().Match(spec);
        Assert.True(match.Success, "docs/page-keys.md names no 'Canonical form version: N'");
        Assert.Equal(PageKeyFormat.Version.ToString(System.Globalization.CultureInfo.InvariantCulture), match.Groups[1].Value);
    }

    [Theory]
    [InlineData("1", "1")]
    [InlineData("1.0", "1")]
    [InlineData("+001.500", "1.5")]
    [InlineData(".5", "0.5")]
    [InlineData("-.0", "0")]
    [InlineData("-0", "0")]
    [InlineData("4.", "4")]
    [InlineData("-12.25", "-12.25")]
    public void Numbers_have_one_spelling(string written, string canonical) =>
        Assert.Equal(canonical, CanonicalNumber.FromPdfText(System.Text.Encoding.ASCII.GetBytes(written)));

    [Fact]
    public void Doubles_and_text_agree()
    {
        Assert.Equal("0.1", CanonicalNumber.FromDouble(0.1));
        Assert.Equal("595.28", CanonicalNumber.FromDouble(595.28));
        Assert.Equal("-3", CanonicalNumber.FromDouble(-3.0));
        Assert.Equal("0.00001", CanonicalNumber.FromDouble(1e-5));
        Assert.Null(CanonicalNumber.FromPdfText("1.2.3"u8));
    }

    public void Dispose() => folder.Dispose();


    private string KeyOf(string content) => folder.Keys(OnePage(content)).Single();

    private string KeyOfStreams(params (string Entries, byte[] Data)[] streams) => KeyOfStreams(streams, null);

    private string KeyOfStreams((string Entries, byte[] Data)[] streams, (string Entries, byte[] Data)? image)
    {
        var pdf = new HandWrittenPdf();
        var catalog = pdf.Reserve();
        var pages = pdf.Reserve();
        var page = pdf.Reserve();
        var font = pdf.Add("<< /Type /Font /Subtype /Type1 /BaseFont /Helvetica >>");
        var parts = streams.Select(s => pdf.AddStream(s.Entries, s.Data)).ToList();
        var xObjects = image is { } i ? $"/XObject << /Im0 {pdf.AddStream(i.Entries, i.Data)} 0 R >>" : string.Empty;
        pdf.Set(page, $"<< /Type /Page /Parent {pages} 0 R /MediaBox [0 0 595 842] /Resources << /Font << /F1 {font} 0 R >> {xObjects} >> /Contents [{string.Join(' ', parts.Select(p => $"{p} 0 R"))}] >>");
        pdf.Set(pages, $"<< /Type /Pages /Kids [{page} 0 R] /Count 1 >>");
        pdf.Set(catalog, $"<< /Type /Catalog /Pages {pages} 0 R >>");
        return folder.Keys(pdf.Build(catalog)).Single();
    }

    private static byte[] OnePage(string content)
    {
        var pdf = new HandWrittenPdf();
        var catalog = pdf.Reserve();
        var pages = pdf.Reserve();
        var page = pdf.Reserve();
        var font = pdf.Add("<< /Type /Font /Subtype /Type1 /BaseFont /Helvetica >>");
        var layer = pdf.Add("<< /Type /OCG /Name (Survey grid) >>");
        var stream = pdf.AddStream(string.Empty, Ascii(content));
        pdf.Set(page, $"<< /Type /Page /Parent {pages} 0 R /MediaBox [0 0 595 842] /Resources << /Font << /F1 {font} 0 R >> /Properties << /Layer1 {layer} 0 R >> >> /Contents {stream} 0 R >>");
        pdf.Set(pages, $"<< /Type /Pages /Kids [{page} 0 R] /Count 1 >>");
        pdf.Set(catalog, $"<< /Type /Catalog /Pages {pages} 0 R >>");
        return pdf.Build(catalog);
    }

    private static byte[] Ascii(string text) => System.Text.Encoding.ASCII.GetBytes(text);

    [GeneratedRegex(@"Canonical form version:\s*\**\s*(\d+)")]
    private static partial Regex SpecVersion();
}
