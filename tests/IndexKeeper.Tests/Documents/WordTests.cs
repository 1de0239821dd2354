using UglyToad.PdfPig.Content;
using UglyToad.PdfPig.Core;
using UglyToad.PdfPig.Fonts.Standard14Fonts;
using UglyToad.PdfPig.Writer;

namespace IndexKeeper.Tests.Documents;

/// <summary>Words of generated pages come back as written, with boxes where the text was placed.</summary>
public sealed class WordTests : IDisposable
{
    private readonly TempFolder folder = new();

    [Fact]
    public void Words_match_the_text_written_with_plausible_boxes()
    {
        using var builder = new PdfDocumentBuilder();
        var font = builder.AddStandard14Font(Standard14Font.Helvetica);
        var page = builder.AddPage(PageSize.A4);
        page.AddText("Harrowmere Water Authority", 12, new PdfPoint(72, 750), font);
        page.AddText("Outfall sampling point 7", 10, new PdfPoint(72, 700), font);
        var content = folder.Read(builder.Build()).Pages.Single();

        Assert.Equal(["Harrowmere", "Water", "Authority", "Outfall", "sampling", "point", "7"], content.Words.Select(w => w.Text));
        Assert.Equal(595, content.Width, 0.5);
        Assert.Equal(842, content.Height, 0.5);

        var first = content.Words[0].Box;
        Assert.InRange(first.Left, 71.5, 72.5);
        Assert.InRange(first.Bottom, 746, 750.5); // baseline at 750, a little lower for descenders
        Assert.InRange(first.Height, 7, 14); // 12-point text: cap height about 0.7 em (from memory)

        // Left to right along the first line, one above the other between lines.
        var line = content.Words.Take(3).Select(w => w.Box).ToList();
        Assert.True(line[0].Right <= line[1].Left && line[1].Right <= line[2].Left);
        Assert.True(content.Words[3].Box.Top < line[0].Bottom);
        Assert.All(content.Words, w => Assert.True(w.Box.Width > 0 && w.Box.Left >= 0 && w.Box.Top <= content.Height));
    }

    [Theory]
    [InlineData(90)]
    [InlineData(180)]
    [InlineData(270)]
    public void Boxes_are_unrotated_and_measured_from_the_visible_box(int rotation)
    {
        // The same text on a page with a crop box off the origin, shown at each /Rotate (ISO 32000-1 §7.7.3.3).
        var upright = folder.Read(Cropped(0)).Pages.Single();
        var rotated = folder.Read(Cropped(rotation)).Pages.Single();

        Assert.Equal(rotation, rotated.Rotation);
        Assert.Equal((350f, 690f), (rotated.Width, rotated.Height));
        Assert.Equal(upright.Words.Select(w => w.Text), rotated.Words.Select(w => w.Text));

        // The parser measures letters of rotated text slightly differently (observed: up to 0.7 point
        // on 12-point text), so boxes agree to within a point rather than exactly.
        for (var i = 0; i < upright.Words.Count; i++)
        {
            Assert.Equal(upright.Words[i].Box.Left, rotated.Words[i].Box.Left, 1.0);
            Assert.Equal(upright.Words[i].Box.Bottom, rotated.Words[i].Box.Bottom, 1.0);
            Assert.Equal(upright.Words[i].Box.Right, rotated.Words[i].Box.Right, 1.0);
            Assert.Equal(upright.Words[i].Box.Top, rotated.Words[i].Box.Top, 1.0);
        }

        // Text drawn at user-space x = 100, y = 700; the crop box starts at (50, 60).
        Assert.Equal(50, upright.Words[0].Box.Left, 0.5);
        Assert.Equal(640, upright.Words[0].Box.Bottom, 0.5);
    }

    public void Dispose() => folder.Dispose();

    private static byte[] Cropped(int rotation)
    {
        var pdf = new HandWrittenPdf();
        var catalog = pdf.Reserve();
        var pages = pdf.Reserve();
        var page = pdf.Reserve();
        var font = pdf.Add("<< /Type /Font /Subtype /Type1 /BaseFont /Helvetica >>");
        var content = pdf.AddStream(string.Empty, SampleDocuments.Latin("BT /F1 12 Tf 100 700 Td (Settling tank) Tj ET"));
        pdf.Set(page, $"<< /Type /Page /Parent {pages} 0 R /MediaBox [0 0 600 800] /CropBox [50 60 400 750] /Rotate {rotation} /Resources << /Font << /F1 {font} 0 R >> >> /Contents {content} 0 R >>");
        pdf.Set(pages, $"<< /Type /Pages /Kids [{page} 0 R] /Count 1 >>");
        pdf.Set(catalog, $"<< /Type /Catalog /Pages {pages} 0 R >>");
        return pdf.Build(catalog);
    }
}
