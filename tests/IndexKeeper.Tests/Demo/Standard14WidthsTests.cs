using IndexKeeper.Demo;
using UglyToad.PdfPig.Core;
using UglyToad.PdfPig.Fonts.Standard14Fonts;
using UglyToad.PdfPig.Writer;

namespace IndexKeeper.Tests.Demo;

public sealed class Standard14WidthsTests
{
    [Theory]
    [InlineData(Standard14Font.Helvetica)]
    [InlineData(Standard14Font.HelveticaBold)]
    [InlineData(Standard14Font.HelveticaOblique)]
    [InlineData(Standard14Font.Courier)]
    public void Widths_equal_the_layout_of_the_pdf_builder(Standard14Font face)
    {
        // The reference is PdfPig's own letter layout for the same font and size.
        var builder = new PdfDocumentBuilder();
        var font = builder.AddStandard14Font(face);
        var page = builder.AddPage(595, 842);
        foreach (string text in new[] { "Kestrel Lane pump station", "a flow of 296 m3/h; 0.46 mg/l (ok)", "WO-23871 [A-2] #5 @ 10:46 & ~x" })
        {
            var letters = page.MeasureText(text, 10, new PdfPoint(0, 0), font);
            double expected = letters[^1].EndBaseLine.X - letters[0].StartBaseLine.X;
            Assert.Equal(expected, Standard14Widths.Measure(face, text, 10), 6);
        }
    }

    [Fact]
    public void Characters_outside_plain_ascii_are_refused()
    {
        Assert.Throws<ArgumentException>(() => Standard14Widths.Measure(Standard14Font.Helvetica, "20 \u00B0C", 10));
        Assert.Throws<ArgumentException>(() => Standard14Widths.Measure(Standard14Font.Helvetica, "Tanner's", 10));
    }
}
