using UglyToad.PdfPig.Content;
using UglyToad.PdfPig.Core;
using UglyToad.PdfPig.Fonts.Standard14Fonts;
using UglyToad.PdfPig.Writer;

namespace IndexKeeper.Tests.Isolation;

/// <summary>Well-formed documents of the demo scenario, written with the PDF library's builder.</summary>
internal static class GoodFiles
{
    public static byte[] InspectionPdf()
    {
        var builder = new PdfDocumentBuilder();
        var font = builder.AddStandard14Font(Standard14Font.Helvetica);
        var first = builder.AddPage(PageSize.A4);
        first.AddText("Harrowmere Water Authority", 14, new PdfPoint(60, 760), font);
        first.AddText("Pump station 4 quarterly inspection", 11, new PdfPoint(60, 730), font);
        var second = builder.AddPage(PageSize.A4);
        second.AddText("Valve chamber readings", 11, new PdfPoint(60, 760), font);
        return builder.Build();
    }
}
