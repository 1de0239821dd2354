using System.Globalization;
using SixLabors.ImageSharp;
using SixLabors.ImageSharp.PixelFormats;
using UglyToad.PdfPig.Content;
using UglyToad.PdfPig.Core;
using UglyToad.PdfPig.Fonts.Standard14Fonts;
using UglyToad.PdfPig.Writer;

namespace IndexKeeper.Tests.Documents;

/// <summary>
/// PDFs the tests generate: one from PdfPig's builder, and a hand-written one that uses every kind of
/// resource the page key follows. Invented content of our demo scenario (Harrowmere Water Authority).
/// </summary>
internal static class SampleDocuments
{
    public static readonly string[] BuilderLines =
    [
        "Harrowmere Water Authority",
        "Intake screen inspection",
        "Reservoir level gauge readings",
        "Pump station maintenance log",
        "Chlorine dosing summary",
        "Valve exercise schedule",
    ];

    /// <summary>A builder document of <paramref name="pages"/> pages of text, shapes and a PNG image.</summary>
    public static byte[] Builder(int pages, Func<int, string>? lineOf = null, int imagePage = 2, byte imageShade = 40)
    {
        using var builder = new PdfDocumentBuilder();
        var font = builder.AddStandard14Font(Standard14Font.Helvetica);
        var bold = builder.AddStandard14Font(Standard14Font.HelveticaBold);
        for (var p = 1; p <= pages; p++)
        {
            var page = builder.AddPage(PageSize.A4);
            page.AddText($"Page {p}", 16, new PdfPoint(72, 780), bold);
            page.AddText(lineOf?.Invoke(p) ?? BuilderLines[(p - 1) % BuilderLines.Length], 12, new PdfPoint(72, 750), font);
            for (var line = 0; line < 20; line++)
            {
                page.AddText($"Reading {line + 1}: station {p}-{line} flow {(p * 37 + line * 11) % 500} cubic metres per hour", 10, new PdfPoint(72, 720 - (line * 14)), font);
            }

            page.DrawRectangle(new PdfPoint(60, 400), 480, 330, 1);
            page.DrawLine(new PdfPoint(72, 390), new PdfPoint(520, 390), 2);
            if (p == imagePage)
            {
                page.AddPng(Png(8, 8, imageShade), new PdfRectangle(72, 200, 272, 380));
            }
        }

        return builder.Build();
    }

    /// <summary>A small PNG of a gradient; <paramref name="shade"/> changes its pixels.</summary>
    public static byte[] Png(int width, int height, byte shade)
    {
        using var image = new Image<Rgb24>(width, height);
        for (var y = 0; y < height; y++)
        {
            for (var x = 0; x < width; x++)
            {
                image[x, y] = new Rgb24((byte)(x * 30), (byte)(y * 30), shade);
            }
        }

        var output = new MemoryStream();
        image.SaveAsPng(output);
        return output.ToArray();
    }

    /// <summary>
    /// A hand-written five-page document (ISO 32000-1 objects written directly). Page use of resources:
    /// page 1 (rotation 90 inherited from an intermediate page-tree node) — font F1, ExtGState GS1, form Fm1
    /// (which draws form Fm2 and uses F1); page 2 — content split over two streams, font F2, image Im1
    /// (Flate + PNG predictor), a crop box, a visible annotation with an appearance, a hidden one and a link;
    /// page 3 — same shared resources as page 1 but uses only F2 and GS2, and an inline image;
    /// page 4 — its own resources, F1 again, content in ASCII85 over Flate; page 5 — RunLength content,
    /// image Im2 (LZW), GS1 again.
    /// </summary>
    public static byte[] Rich(RichOptions? options = null)
    {
        var o = options ?? new RichOptions();
        var pdf = new HandWrittenPdf();
        var catalog = pdf.Reserve();
        var root = pdf.Reserve();
        var node = pdf.Reserve();
        var pages = Enumerable.Range(0, 5).Select(_ => pdf.Reserve()).ToArray();

        var program = System.Text.Encoding.ASCII.GetBytes(string.Concat(Enumerable.Repeat("HARROWMERE-GLYPH-OUTLINES;", 40)));
        program[o.FontProgramByteIndex] ^= o.FontProgramFlip;
        var fontFile = pdf.AddStream($"/Length1 {program.Length} /Filter /FlateDecode", TestEncoders.Flate(program));
        var descriptor = pdf.Add($"<< /Type /FontDescriptor /FontName /HarrowSans /Flags 32 /FontBBox [0 -200 1000 900] /ItalicAngle 0 /Ascent 800 /Descent -200 /CapHeight 700 /StemV 80 /FontFile2 {fontFile} 0 R >>");
        var widths = string.Join(' ', Enumerable.Range(32, 95).Select(c => c == 'a' ? o.WidthOfA.ToString(CultureInfo.InvariantCulture) : "556"));
        var f1 = pdf.Add($"<< /Type /Font /Subtype /TrueType /BaseFont /HarrowSans /FirstChar 32 /LastChar 126 /Widths [{widths}] /FontDescriptor {descriptor} 0 R /Encoding /WinAnsiEncoding >>");
        var f2 = pdf.Add("<< /Type /Font /Subtype /Type1 /BaseFont /Helvetica /Encoding /WinAnsiEncoding >>");
        var gs1 = pdf.Add($"<< /Type /ExtGState /ca {o.FillAlpha} /CA 0.75 >>");
        var gs2 = pdf.Add("<< /Type /ExtGState /LW 2 >>");

        var fm2 = pdf.AddStream("/Type /XObject /Subtype /Form /BBox [0 0 100 100]", Latin($"0 0 m {o.Form2LineEnd} 50 l S"));
        var fm1 = pdf.Reserve();
        var fm1Resources = $"<< /Font << /F1 {f1} 0 R >> /XObject << /Fm2 {fm2} 0 R >> >>";
        pdf.SetStream(fm1, $"/Type /XObject /Subtype /Form /BBox [0 0 200 100] /Matrix [1 0 0 1 0 0] /Resources {fm1Resources} /Filter /FlateDecode",
            TestEncoders.Flate(Latin($"BT /F1 9 Tf 5 80 Td ({o.FormText}) Tj ET\n/Fm2 Do")));

        var pixels = new byte[4 * 4 * 3];
        for (var i = 0; i < pixels.Length; i++)
        {
            pixels[i] = (byte)(i * 5);
        }

        pixels[o.ImagePixelIndex] ^= o.ImagePixelFlip;
        var im1 = pdf.AddStream(
            "/Type /XObject /Subtype /Image /Width 4 /Height 4 /ColorSpace /DeviceRGB /BitsPerComponent 8 /Filter /FlateDecode /DecodeParms << /Predictor 15 /Colors 3 /Columns 4 >>",
            TestEncoders.Flate(TestEncoders.PngPredict(pixels, 3, 12)));
        var grey = Enumerable.Range(0, 64).Select(i => (byte)(i * 3)).ToArray();
        var im2 = pdf.AddStream("/Type /XObject /Subtype /Image /Width 8 /Height 8 /ColorSpace /DeviceGray /BitsPerComponent 8 /Filter /LZWDecode", TestEncoders.Lzw(grey));

        var shared = pdf.Add($"<< /Font << /F1 {f1} 0 R /F2 {f2} 0 R >> /ExtGState << /GS1 {gs1} 0 R /GS2 {gs2} 0 R >> /XObject << /Fm1 {fm1} 0 R /Im1 {im1} 0 R /Im2 {im2} 0 R >> >>");

        // Page 1: inherits /Rotate and /Resources from the intermediate node.
        var c1 = pdf.AddStream("/Filter /FlateDecode", TestEncoders.Flate(Latin(
            $"q\nBT /F1 14 Tf 72 720 Td (Harrowmere {o.Page1Word} report) Tj ET\n/GS1 gs 0.2 0.4 0.8 rg 72 600 200 80 re f\nq 1 0 0 1 72 400 cm /Fm1 Do Q\nQ\n")));
        pdf.Set(pages[0], $"<< /Type /Page /Parent {node} 0 R /Contents {c1} 0 R >>");
        pdf.Set(node, $"<< /Type /Pages /Parent {root} 0 R /Kids [{pages[0]} 0 R] /Count 1 /Rotate {o.NodeRotate} /Resources {shared} 0 R /MediaBox [0 0 595 842] >>");

        // Page 2: content split mid-operation list into two streams; annotations.
        var c2a = pdf.AddStream(string.Empty, Latin("BT /F2 12 Tf 72 720 Td (Treatment works) Tj"));
        var c2b = pdf.AddStream("/Filter /FlateDecode", TestEncoders.Flate(Latin(" ET\nq 100 0 0 100 72 500 cm /Im1 Do Q")));
        var appearance = pdf.AddStream(
            $"/Type /XObject /Subtype /Form /BBox [0 0 120 30] /Resources << /Font << /F2 {f2} 0 R >> >>",
            Latin($"0.9 0.9 0.2 rg 0 0 120 30 re f BT /F2 10 Tf 4 10 Td ({o.StampText}) Tj ET"));
        var visible = pdf.Add($"<< /Type /Annot /Subtype /Stamp /Rect [400 700 520 730] /F 4 /M ({o.StampModified}) /NM (stamp-1) /AP << /N {appearance} 0 R >> >>");
        var hiddenAppearance = pdf.AddStream("/Type /XObject /Subtype /Form /BBox [0 0 10 10]", Latin($"{o.HiddenSquareColour} 0 0 10 10 re f"));
        var hidden = pdf.Add($"<< /Type /Annot /Subtype /Square /Rect [10 10 20 20] /F 2 /AP << /N {hiddenAppearance} 0 R >> >>");
        var link = pdf.Add("<< /Type /Annot /Subtype /Link /Rect [72 715 200 735] /Border [0 0 0] /A << /S /URI /URI (https://example.org/harrowmere) >> >>");
        pdf.Set(pages[1], $"<< /Type /Page /Parent {root} 0 R /MediaBox [0 0 595 842] /CropBox [20 20 575 822] /Resources {shared} 0 R /Contents [{c2a} 0 R {c2b} 0 R] /Annots [{visible} 0 R {hidden} 0 R {link} 0 R] >>");

        // Page 3: shared resources, uses F2 and GS2 only; an inline image in ASCIIHex.
        var inline = Convert.ToHexString(Enumerable.Range(0, 12).Select(i => (byte)(i * 20)).ToArray());
        var c3 = pdf.AddStream(string.Empty, Latin(
            $"BT /F2 12 Tf {o.Page3TextX} 720 Td (Sludge thickener) Tj ET\n/GS2 gs 72 650 m 300 650 l S\nq 40 0 0 30 72 560 cm BI /W 2 /H 2 /CS /RGB /BPC 8 /F /AHx ID {inline}> EI Q"));
        pdf.Set(pages[2], $"<< /Type /Page /Parent {root} 0 R /MediaBox [0 0 {o.Page3Width} 842] /Resources {shared} 0 R /Contents {c3} 0 R >>");

        // Page 4: own resources naming the same F1 object; ASCII85 over Flate.
        var c4 = pdf.AddStream("/Filter [/ASCII85Decode /FlateDecode]", TestEncoders.Ascii85(TestEncoders.Flate(Latin(
            "BT /F1 11 Tf 72 700 Td (Filter bed backwash) Tj 0 -14 Td [(Turbidity ) -250 (0.3 NTU)] TJ ET 1 0 0 RG 72 600 m 500 600 l S"))));
        pdf.Set(pages[3], $"<< /Type /Page /Parent {root} 0 R /MediaBox [0 0 595 842] /Resources << /Font << /F1 {f1} 0 R >> >> /Contents {c4} 0 R >>");

        // Page 5: RunLength content, LZW image, GS1 again.
        var c5 = pdf.AddStream("/Filter /RunLengthDecode", TestEncoders.RunLength(Latin(
            "/GS1 gs BT /F2 12 Tf 72 720 Td (Clear water tank) Tj ET q 80 0 0 80 72 560 cm /Im2 Do Q 0 0 0 rg 72 500 300 4 re f")));
        pdf.Set(pages[4], $"<< /Type /Page /Parent {root} 0 R /MediaBox [0 0 595 842] /Rotate {o.Page5Rotate} /Resources {shared} 0 R /Contents {c5} 0 R >>");

        pdf.Set(root, $"<< /Type /Pages /Kids [{node} 0 R {pages[1]} 0 R {pages[2]} 0 R {pages[3]} 0 R {pages[4]} 0 R] /Count 5 >>");
        pdf.Set(catalog, $"<< /Type /Catalog /Pages {root} 0 R >>");
        var info = pdf.Add("<< /Title (Harrowmere treatment works inspection) /Producer (IndexKeeper tests) >>");
        return pdf.Build(catalog, $"/Info {info} 0 R");
    }

    public static byte[] Latin(string text) => HandWrittenPdf.Latin1(text);
}
