using DocumentFormat.OpenXml;
using DocumentFormat.OpenXml.Packaging;
using DocumentFormat.OpenXml.Wordprocessing;
using Presentation = DocumentFormat.OpenXml.Presentation;
using Drawing = DocumentFormat.OpenXml.Drawing;
using Sheet = DocumentFormat.OpenXml.Spreadsheet;

namespace IndexKeeper.Tests.Readers;

/// <summary>Office documents made in the test with DocumentFormat.OpenXml 3.3 (an invented harbour board's papers).</summary>
internal static class OfficeSamples
{
    /// <summary>A two-page letter (an explicit page break); <paramref name="author"/> and <paramref name="saved"/> are metadata only.</summary>
    public static byte[] Letter(string author, DateTime saved, string firstLine = "Harbour board of Kellmarsh: berth allocation for the spring season")
    {
        using var stream = new MemoryStream();
        using (var document = WordprocessingDocument.Create(stream, WordprocessingDocumentType.Document))
        {
            var main = document.AddMainDocumentPart();
            main.Document = new Document(new Body(
                Paragraph(firstLine),
                Paragraph("Vessels above forty metres moor at the eastern quay from the first of April."),
                new Paragraph(new Run(new Break { Type = BreakValues.Page })),
                Paragraph("Annex: tide windows and pilot rota for the harbour master's office.")));
            document.PackageProperties.Creator = author;
            document.PackageProperties.Created = saved;
            document.PackageProperties.Modified = saved;
            document.PackageProperties.LastModifiedBy = author;
            document.PackageProperties.Revision = saved.Minute.ToString(System.Globalization.CultureInfo.InvariantCulture);
        }

        return stream.ToArray();
    }

    /// <summary>
    /// A report of <paramref name="pages"/> pages (explicit page breaks), each a heading and paragraphs of
    /// berth figures that differ by <paramref name="seed"/> and page.
    /// </summary>
    public static byte[] Report(int pages, int seed)
    {
        using var stream = new MemoryStream();
        using (var document = WordprocessingDocument.Create(stream, WordprocessingDocumentType.Document))
        {
            var body = new Body();
            for (var page = 1; page <= pages; page++)
            {
                if (page > 1)
                {
                    body.Append(new Paragraph(new Run(new Break { Type = BreakValues.Page })));
                }

                body.Append(Paragraph($"Kellmarsh harbour board, quarterly berth report {seed}, section {page}"));
                for (var line = 0; line < 12; line++)
                {
                    body.Append(Paragraph(
                        $"Berth {(seed + page + line) % 24 + 1}: {(seed * 13 + page * 7 + line * 3) % 90 + 10} calls, mean stay {(page + line) % 9 + 2} hours, "
                        + $"dredged depth {(seed + line) % 5 + 8}.{page % 10} metres, pilot boardings {(line * 5 + page) % 40}."));
                }
            }

            document.AddMainDocumentPart().Document = new Document(body);
        }

        return stream.ToArray();
    }

    /// <summary>A workbook of one sheet with a table of mooring fees, <paramref name="rows"/> rows.</summary>
    public static byte[] Workbook(uint rows)
    {
        using var stream = new MemoryStream();
        using (var document = SpreadsheetDocument.Create(stream, SpreadsheetDocumentType.Workbook))
        {
            var workbook = document.AddWorkbookPart();
            workbook.Workbook = new Sheet.Workbook();
            var sheetPart = workbook.AddNewPart<WorksheetPart>();
            var data = new Sheet.SheetData();
            for (uint row = 1; row <= rows; row++)
            {
                data.Append(new Sheet.Row(
                    new Sheet.Cell { CellReference = "A" + row, DataType = Sheet.CellValues.String, CellValue = new Sheet.CellValue("Berth " + row) },
                    new Sheet.Cell { CellReference = "B" + row, CellValue = new Sheet.CellValue((row * 37).ToString(System.Globalization.CultureInfo.InvariantCulture)) })
                { RowIndex = row });
            }

            sheetPart.Worksheet = new Sheet.Worksheet(data);
            workbook.Workbook.AppendChild(new Sheet.Sheets(new Sheet.Sheet { Id = workbook.GetIdOfPart(sheetPart), SheetId = 1, Name = "Fees" }));
        }

        return stream.ToArray();
    }

    /// <summary>A presentation of <paramref name="slides"/> title slides, built as a minimal valid PresentationML package.</summary>
    public static byte[] Deck(int slides)
    {
        using var stream = new MemoryStream();
        using (var document = PresentationDocument.Create(stream, PresentationDocumentType.Presentation))
        {
            var presentation = document.AddPresentationPart();
            presentation.Presentation = new Presentation.Presentation();
            var master = presentation.AddNewPart<SlideMasterPart>("rIdMaster");
            var layout = master.AddNewPart<SlideLayoutPart>("rIdLayout");
            layout.SlideLayout = new Presentation.SlideLayout(new Presentation.CommonSlideData(EmptyTree()));
            master.SlideMaster = new Presentation.SlideMaster(
                new Presentation.CommonSlideData(EmptyTree()),
                new Presentation.ColorMap
                {
                    Background1 = Drawing.ColorSchemeIndexValues.Light1, Text1 = Drawing.ColorSchemeIndexValues.Dark1,
                    Background2 = Drawing.ColorSchemeIndexValues.Light2, Text2 = Drawing.ColorSchemeIndexValues.Dark2,
                    Accent1 = Drawing.ColorSchemeIndexValues.Accent1, Accent2 = Drawing.ColorSchemeIndexValues.Accent2,
                    Accent3 = Drawing.ColorSchemeIndexValues.Accent3, Accent4 = Drawing.ColorSchemeIndexValues.Accent4,
                    Accent5 = Drawing.ColorSchemeIndexValues.Accent5, Accent6 = Drawing.ColorSchemeIndexValues.Accent6,
                    Hyperlink = Drawing.ColorSchemeIndexValues.Hyperlink, FollowedHyperlink = Drawing.ColorSchemeIndexValues.FollowedHyperlink,
                },
                new Presentation.SlideLayoutIdList(new Presentation.SlideLayoutId { Id = 2147483649U, RelationshipId = "rIdLayout" }));
            var theme = master.AddNewPart<ThemePart>("rIdTheme");
            theme.Theme = Theme();
            presentation.AddPart(theme, "rIdTheme");
            var ids = new Presentation.SlideIdList();
            for (var i = 1; i <= slides; i++)
            {
                var slide = presentation.AddNewPart<SlidePart>("rIdSlide" + i);
                slide.Slide = new Presentation.Slide(new Presentation.CommonSlideData(new Presentation.ShapeTree([
                    .. TreeProperties(),
                    new Presentation.Shape(
                        new Presentation.NonVisualShapeProperties(
                            new Presentation.NonVisualDrawingProperties { Id = 2U, Name = "Title" },
                            new Presentation.NonVisualShapeDrawingProperties(),
                            new Presentation.ApplicationNonVisualDrawingProperties()),
                        new Presentation.ShapeProperties(new Drawing.Transform2D(
                            new Drawing.Offset { X = 914400L, Y = 914400L }, new Drawing.Extents { Cx = 6400800L, Cy = 1371600L })),
                        new Presentation.TextBody(
                            new Drawing.BodyProperties(),
                            new Drawing.Paragraph(new Drawing.Run(new Drawing.Text("Quay works, stage " + i)))))])));
                slide.AddPart(layout);
                ids.Append(new Presentation.SlideId { Id = (uint)(255 + i), RelationshipId = "rIdSlide" + i });
            }

            presentation.Presentation.Append(
                new Presentation.SlideMasterIdList(new Presentation.SlideMasterId { Id = 2147483648U, RelationshipId = "rIdMaster" }),
                ids,
                new Presentation.SlideSize { Cx = 9144000, Cy = 6858000 },
                new Presentation.NotesSize { Cx = 6858000, Cy = 9144000 });
        }

        return stream.ToArray();
    }

    private static Paragraph Paragraph(string text) => new(new Run(new Text(text)));

    private static Presentation.ShapeTree EmptyTree() => new(TreeProperties().AsEnumerable());

    private static OpenXmlElement[] TreeProperties() =>
    [
        new Presentation.NonVisualGroupShapeProperties(
            new Presentation.NonVisualDrawingProperties { Id = 1U, Name = string.Empty },
            new Presentation.NonVisualGroupShapeDrawingProperties(),
            new Presentation.ApplicationNonVisualDrawingProperties()),
        new Presentation.GroupShapeProperties(new Drawing.TransformGroup()),
    ];

    private static Drawing.Theme Theme()
    {
        Drawing.Color2Type Colour<T>(string hex) where T : Drawing.Color2Type, new() => new T { RgbColorModelHex = new Drawing.RgbColorModelHex { Val = hex } };
        var fonts = new Drawing.FontScheme(
            new Drawing.MajorFont(new Drawing.LatinFont { Typeface = "Liberation Sans" }, new Drawing.EastAsianFont { Typeface = string.Empty }, new Drawing.ComplexScriptFont { Typeface = string.Empty }),
            new Drawing.MinorFont(new Drawing.LatinFont { Typeface = "Liberation Sans" }, new Drawing.EastAsianFont { Typeface = string.Empty }, new Drawing.ComplexScriptFont { Typeface = string.Empty }))
        { Name = "Plain" };
        var fill = new Drawing.SolidFill(new Drawing.SchemeColor { Val = Drawing.SchemeColorValues.PhColor });
        return new Drawing.Theme(new Drawing.ThemeElements(
            new Drawing.ColorScheme(
                Colour<Drawing.Dark1Color>("000000"), Colour<Drawing.Light1Color>("FFFFFF"), Colour<Drawing.Dark2Color>("1F2A44"),
                Colour<Drawing.Light2Color>("E7E6E6"), Colour<Drawing.Accent1Color>("4472C4"), Colour<Drawing.Accent2Color>("ED7D31"),
                Colour<Drawing.Accent3Color>("A5A5A5"), Colour<Drawing.Accent4Color>("FFC000"), Colour<Drawing.Accent5Color>("5B9BD5"),
                Colour<Drawing.Accent6Color>("70AD47"), Colour<Drawing.Hyperlink>("0563C1"), Colour<Drawing.FollowedHyperlinkColor>("954F72"))
            { Name = "Plain" },
            fonts,
            new Drawing.FormatScheme(
                new Drawing.FillStyleList(fill.CloneNode(true), fill.CloneNode(true), fill.CloneNode(true)),
                new Drawing.LineStyleList(new Drawing.Outline(), new Drawing.Outline(), new Drawing.Outline()),
                new Drawing.EffectStyleList(new Drawing.EffectStyle(new Drawing.EffectList()), new Drawing.EffectStyle(new Drawing.EffectList()), new Drawing.EffectStyle(new Drawing.EffectList())),
                new Drawing.BackgroundFillStyleList(fill.CloneNode(true), fill.CloneNode(true), fill.CloneNode(true)))
            { Name = "Plain" }))
        { Name = "Plain" };
    }
}
