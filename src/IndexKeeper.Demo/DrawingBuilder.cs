namespace IndexKeeper.Demo;

/// <summary>A3 landscape drawings: a zoned frame, a title block, and a network plan or process schematic.</summary>
internal static class DrawingBuilder
{
    private static readonly PaperSize Sheet = PaperSize.A3.Landscape;
    private const double Border = 20;

    public static byte[] Render(DrawingSpec spec, DemoRandom random)
    {
        var composer = new PdfComposer(
            "drawing/" + spec.Number,
            DemoPdfInfo.Issued(spec.Number + " " + spec.Title, spec.DrawnBy, "Drawing", spec.Date, new TimeOnly(14, 0)));
        for (int sheet = 1; sheet <= spec.Sheets; sheet++)
        {
            var page = composer.AddPage(Sheet);
            Frame(page);
            TitleBlock(page, spec, sheet, random);
            double left = Border + 30;
            double bottom = Border + 150;
            double width = Sheet.Width - 2 * Border - 60;
            double height = Sheet.Height - bottom - Border - 30;
            if (sheet % 2 == 1)
            {
                SchematicDrawer.Network(page, left, bottom, width, height, random);
            }
            else
            {
                SchematicDrawer.Process(page, left, bottom + height * 0.2, width, height * 0.6, random, spec.Topic);
            }

            Notes(page, spec, random);
        }

        return composer.Build();
    }

    private static void Frame(PageWriter page)
    {
        page.Rectangle(Border, Border, Sheet.Width - 2 * Border, Sheet.Height - 2 * Border, 1.5);
        page.Rectangle(Border + 12, Border + 12, Sheet.Width - 2 * Border - 24, Sheet.Height - 2 * Border - 24, 0.5);
        const int Columns = 8;
        const int Rows = 4;
        double cellWidth = (Sheet.Width - 2 * Border) / Columns;
        double cellHeight = (Sheet.Height - 2 * Border) / Rows;
        for (int column = 0; column < Columns; column++)
        {
            double x = Border + column * cellWidth;
            page.TextCentred(DemoNumber.Integer(column + 1), x + cellWidth / 2, Sheet.Height - Border - 9, 7);
            page.TextCentred(DemoNumber.Integer(column + 1), x + cellWidth / 2, Border + 3, 7);
            if (column > 0)
            {
                page.Line(x, Sheet.Height - Border, x, Sheet.Height - Border - 12, 0.5);
                page.Line(x, Border, x, Border + 12, 0.5);
            }
        }

        for (int row = 0; row < Rows; row++)
        {
            double y = Sheet.Height - Border - (row + 1) * cellHeight;
            string letter = ((char)('A' + row)).ToString();
            page.TextCentred(letter, Border + 6, y + cellHeight / 2, 7);
            page.TextCentred(letter, Sheet.Width - Border - 6, y + cellHeight / 2, 7);
        }
    }

    private static void TitleBlock(PageWriter page, DrawingSpec spec, int sheet, DemoRandom random)
    {
        double right = Sheet.Width - Border - 12;
        double left = right - 380;
        double bottom = Border + 12;
        string[][] rows =
        [
            ["Checked", random.Pick(DemoVocabulary.People), "Sheet", DemoNumber.Integer(sheet) + " of " + DemoNumber.Integer(spec.Sheets)],
            ["Drawn", spec.DrawnBy, "Revision", spec.Revision],
            ["Scale", "Not to scale", "Date", DemoNumber.Date(spec.Date)],
        ];
        double y = bottom;
        foreach (var row in rows)
        {
            page.Rectangle(left, y, 380, 18, 0.5);
            page.Line(left + 190, y, left + 190, y + 18, 0.5);
            page.Text(row[0], left + 4, y + 6, 6.5, page.Fonts.Bold);
            page.Text(row[1], left + 52, y + 6, 8);
            page.Text(row[2], left + 194, y + 6, 6.5, page.Fonts.Bold);
            page.Text(row[3], left + 242, y + 6, 8);
            y += 18;
        }

        page.Rectangle(left, y, 380, 44, 0.8);
        page.Text(spec.Title, left + 6, y + 26, 11, page.Fonts.Bold);
        page.Text(spec.Site + "  -  drawing " + spec.Number, left + 6, y + 10, 9);
        y += 44;
        page.FillColour(28, 72, 118);
        page.Rectangle(left, y, 380, 22, 0.8, fill: true);
        page.FillColour(255, 255, 255);
        page.Text("HARROWMERE WATER AUTHORITY", left + 6, y + 7, 10, page.Fonts.Bold);
        page.ResetColour();
    }

    private static void Notes(PageWriter page, DrawingSpec spec, DemoRandom random)
    {
        var text = new DemoText(random, spec.Topic, spec.Site);
        double x = Border + 30;
        double y = Border + 120;
        page.Text("NOTES", x, y, 8, page.Fonts.Bold);
        for (int note = 1; note <= 4; note++)
        {
            y -= 11;
            string sentence = text.Sentence();
            var line = page.Wrap(sentence, 620, 7, page.Fonts.Regular)[0];
            page.Text(DemoNumber.Integer(note) + ".  " + line, x, y, 7);
        }
    }
}
