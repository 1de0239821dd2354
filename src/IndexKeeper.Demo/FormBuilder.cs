namespace IndexKeeper.Demo;

/// <summary>Inspection forms of one or two pages: labelled boxes, a check list with ticked boxes, readings
/// and typed-in values, and on the second page defects, notes and signatures.</summary>
internal static class FormBuilder
{
    public static byte[] Render(FormSpec spec, DemoRandom random)
    {
        var composer = new PdfComposer(
            "form/" + spec.Code,
            DemoPdfInfo.Issued(spec.Code + " " + spec.Title, spec.Inspector, "Inspection form", spec.Date, new TimeOnly(16, 0)));
        var text = new DemoText(random, spec.Topic, spec.Site);
        for (int pageNumber = 1; pageNumber <= spec.PageCount; pageNumber++)
        {
            var page = composer.AddPage(PaperSize.A4);
            page.Furniture(
                "Harrowmere Water Authority",
                "Form " + spec.Code,
                spec.Title + "  -  " + DemoNumber.Date(spec.Date),
                "Sheet " + DemoNumber.Integer(pageNumber) + " of " + DemoNumber.Integer(spec.PageCount));
            if (pageNumber == 1)
            {
                FirstSheet(page, spec, text, random);
            }
            else
            {
                SecondSheet(page, spec, text, random);
            }
        }

        return composer.Build();
    }

    private static void FirstSheet(PageWriter page, FormSpec spec, DemoText text, DemoRandom random)
    {
        double top = page.Top - 8;
        page.FillColour(28, 72, 118);
        page.Rectangle(PageWriter.Margin, top - 34, page.ContentWidth, 34, 0.5, fill: true);
        page.FillColour(255, 255, 255);
        page.Text(spec.Title.ToUpperInvariant(), PageWriter.Margin + 10, top - 22, 13, page.Fonts.Bold);
        page.ResetColour();

        string[][] fields =
        [
            ["Site", spec.Site, "Date", DemoNumber.Date(spec.Date)],
            ["Inspector", spec.Inspector, "Time on site", DemoNumber.Integer(random.Next(7, 15)) + ":" + DemoNumber.Integer(random.Next(10, 59))],
            ["Weather", random.Pick(["dry, overcast", "light rain", "clear, cold", "windy", "fog"]), "Permit no.", "PTW-" + DemoNumber.Integer(random.Next(1000, 9999))],
        ];
        double y = top - 44;
        double half = page.ContentWidth / 2;
        foreach (var field in fields)
        {
            LabelledBox(page, PageWriter.Margin, y, half, field[0], field[1]);
            LabelledBox(page, PageWriter.Margin + half, y, half, field[2], field[3]);
            y -= 34;
        }

        y -= 14;
        page.Text("Check list", PageWriter.Margin, y, 11, page.Fonts.Bold);
        y -= 8;
        double[] columns = [250, 40, 40, page.ContentWidth - 330];
        double rowHeight = 20;
        page.FillColour(222, 230, 238);
        page.Rectangle(PageWriter.Margin, y - rowHeight, page.ContentWidth, rowHeight, 0.5, fill: true);
        page.ResetColour();
        string[] header = ["Item", "OK", "Defect", "Comment"];
        double x = PageWriter.Margin;
        for (int column = 0; column < columns.Length; column++)
        {
            page.Text(header[column], x + 4, y - 14, 9, page.Fonts.Bold);
            x += columns[column];
        }

        int items = random.Next(9, 14);
        double tableTop = y;
        y -= rowHeight;
        for (int item = 0; item < items; item++)
        {
            string check = "Check " + text.Part() + " of " + text.Equipment();
            page.Text(Fit(page, check, columns[0] - 8, 8.5), PageWriter.Margin + 4, y - 14, 8.5);
            bool defect = random.Chance(15);
            double boxX = PageWriter.Margin + columns[0] + (defect ? columns[1] : 0) + 14;
            page.Rectangle(PageWriter.Margin + columns[0] + 14, y - 16, 12, 12, 0.6);
            page.Rectangle(PageWriter.Margin + columns[0] + columns[1] + 14, y - 16, 12, 12, 0.6);
            page.Line(boxX + 2, y - 14, boxX + 10, y - 6, 1.2);
            page.Line(boxX + 2, y - 6, boxX + 10, y - 14, 1.2);
            if (defect || random.Chance(30))
            {
                page.FillColour(20, 40, 140);
                string comment = defect ? "see defect list" : text.Reading();
                page.Text(Fit(page, comment, columns[3] - 8, 8, page.Fonts.Typed), PageWriter.Margin + columns[0] + columns[1] + columns[2] + 4, y - 14, 8, page.Fonts.Typed);
                page.ResetColour();
            }

            y -= rowHeight;
            page.Line(PageWriter.Margin, y, page.Width - PageWriter.Margin, y, 0.4);
        }

        page.Rectangle(PageWriter.Margin, y, page.ContentWidth, tableTop - y, 0.8);
        x = PageWriter.Margin;
        for (int column = 0; column < columns.Length - 1; column++)
        {
            x += columns[column];
            page.Line(x, tableTop, x, y, 0.4);
        }

        y -= 22;
        page.Text("Readings", PageWriter.Margin, y, 11, page.Fonts.Bold);
        y -= 8;
        double quarter = page.ContentWidth / 2;
        for (int reading = 0; reading < 4; reading++)
        {
            string value = text.Reading();
            LabelledBox(page, PageWriter.Margin + (reading % 2) * quarter, y - (reading / 2) * 34, quarter, "Reading " + DemoNumber.Integer(reading + 1), value);
        }
    }

    private static void SecondSheet(PageWriter page, FormSpec spec, DemoText text, DemoRandom random)
    {
        double y = page.Top - 20;
        page.Text("Defects and actions", PageWriter.Margin, y, 12, page.Fonts.Bold);
        var rows = new List<IReadOnlyList<string>>();
        for (int row = random.Next(2, 6); row > 0; row--)
        {
            rows.Add([DemoNumber.Integer(rows.Count + 1), text.Sentence(), text.Role(), random.Pick(["urgent", "7 days", "28 days", "next visit"])]);
        }

        y = TableDrawer.Draw(page, PageWriter.Margin, y - 10, [30, 280, 100, 73], ["No.", "Defect found", "Passed to", "Priority"], rows);

        y -= 30;
        page.Text("Notes", PageWriter.Margin, y, 12, page.Fonts.Bold);
        y -= 10;
        double notesTop = y;
        page.Rectangle(PageWriter.Margin, y - 200, page.ContentWidth, 200, 0.8);
        page.StrokeColour(190, 190, 190);
        for (double line = y - 20; line > y - 200; line -= 20)
        {
            page.Line(PageWriter.Margin + 6, line, page.Width - PageWriter.Margin - 6, line, 0.3);
        }

        page.ResetColour();
        page.FillColour(20, 40, 140);
        var notes = page.Wrap(text.Paragraph(3), page.ContentWidth - 20, 9, page.Fonts.Typed);
        page.Lines(notes.Take(9).ToList(), PageWriter.Margin + 8, notesTop - 16, 9, page.Fonts.Typed, 20);
        page.ResetColour();

        y -= 240;
        string[] roles = ["Inspected by", "Checked by"];
        string[] names = [spec.Inspector, text.Person()];
        for (int signature = 0; signature < 2; signature++)
        {
            double x = PageWriter.Margin + signature * page.ContentWidth / 2;
            page.Text(roles[signature], x, y, 9, page.Fonts.Bold);
            page.Line(x, y - 30, x + 200, y - 30, 0.6);
            page.Text(names[signature], x, y - 42, 9);
            page.FillColour(20, 40, 140);
            page.Text(DemoNumber.Date(spec.Date), x + 130, y - 42, 9, page.Fonts.Typed);
            page.ResetColour();
        }
    }

    /// <summary>A box with a small label in its corner and a typed value.</summary>
    private static void LabelledBox(PageWriter page, double x, double top, double width, string label, string value)
    {
        page.Rectangle(x, top - 30, width, 30, 0.6);
        page.Text(label, x + 4, top - 9, 7, page.Fonts.Bold);
        page.FillColour(20, 40, 140);
        page.Text(Fit(page, value, width - 12, 10, page.Fonts.Typed), x + 8, top - 24, 10, page.Fonts.Typed);
        page.ResetColour();
    }

    /// <summary>Shortens text word by word until it fits the width.</summary>
    private static string Fit(PageWriter page, string text, double width, double size, UglyToad.PdfPig.Writer.PdfDocumentBuilder.AddedFont? font = null)
    {
        var used = font ?? page.Fonts.Regular;
        while (page.TextWidth(text, used, size) > width && text.Contains(' ', StringComparison.Ordinal))
        {
            text = text[..text.LastIndexOf(' ')];
        }

        return text;
    }
}
