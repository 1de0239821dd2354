namespace IndexKeeper.Demo;

/// <summary>Operation and maintenance manuals: cover, contents, numbered sections of text, procedures,
/// tables, schematics and photographs, and appendices.</summary>
internal static class ManualBuilder
{
    public static byte[] Render(ManualSpec spec, IReadOnlyList<ManualPage> pages) => Render(spec, pages, Info(spec));

    public static byte[] Render(ManualSpec spec, IReadOnlyList<ManualPage> pages, DemoPdfInfo info)
    {
        var composer = new PdfComposer("manual/" + spec.Code, info);
        foreach (var page in pages)
        {
            var writer = composer.AddPage(PaperSize.A4);
            var random = new DemoRandom(page.Seed);
            var text = new DemoText(random, spec.Topic, spec.Site);
            if (page.Kind != ManualPageKind.Cover)
            {
                writer.Furniture(
                    "Harrowmere Water Authority",
                    spec.Code + "  " + spec.Title,
                    spec.Code + " Rev " + spec.Revision + "  -  " + spec.Site,
                    "Page " + page.Label);
            }

            switch (page.Kind)
            {
                case ManualPageKind.Cover:
                    Cover(writer, spec, random);
                    break;
                case ManualPageKind.Contents:
                    Contents(writer, pages);
                    break;
                case ManualPageKind.Appendix:
                    Appendix(writer, page, text, random);
                    break;
                default:
                    Body(writer, page, text, random, spec);
                    break;
            }
        }

        return composer.Build();
    }

    public static DemoPdfInfo Info(ManualSpec spec) =>
        DemoPdfInfo.Issued(spec.Code + " " + spec.Title, spec.Author, "Operation and maintenance manual", spec.Issued, new TimeOnly(9, 0));

    private static void Cover(PageWriter page, ManualSpec spec, DemoRandom random)
    {
        page.FillColour(28, 72, 118);
        page.Rectangle(0, page.Height - 170, page.Width, 170, 0, fill: true);
        page.FillColour(255, 255, 255);
        page.Text("HARROWMERE WATER AUTHORITY", PageWriter.Margin, page.Height - 70, 14, page.Fonts.Bold);
        page.Text("Operation and maintenance manual", PageWriter.Margin, page.Height - 95, 12);
        page.ResetColour();

        double y = page.Height - 230;
        foreach (string line in page.Wrap(spec.Title, page.ContentWidth, 24, page.Fonts.Bold))
        {
            page.Text(line, PageWriter.Margin, y, 24, page.Fonts.Bold);
            y -= 30;
        }

        page.Text(spec.Site, PageWriter.Margin, y - 6, 14);
        byte[] photo = SitePhotoBuilder.Paint(random).EncodeJpeg(85);
        page.Jpeg(photo, PageWriter.Margin, 250, page.ContentWidth, page.ContentWidth * SitePhotoBuilder.Height / SitePhotoBuilder.Width);

        string[][] rows =
        [
            ["Document", spec.Code], ["Revision", spec.Revision], ["Issued", DemoNumber.Date(spec.Issued)],
            ["Prepared by", spec.Author], ["Approved by", random.Pick(DemoVocabulary.People)],
        ];
        TableDrawer.Draw(page, PageWriter.Margin, 220, [120, 200], ["Document control", ""], rows, 9);
    }

    private static void Contents(PageWriter page, IReadOnlyList<ManualPage> pages)
    {
        var flow = new TextFlow(page, page.Top - 10);
        flow.Heading("Contents", 18);
        flow.Space(12);
        // Sorted by section so the contents page does not depend on the order the pages are bound in.
        foreach (var opening in pages.Where(page => page.OpensSection).OrderBy(page => page.Section))
        {
            string number = opening.Kind == ManualPageKind.Appendix ? "A" : DemoNumber.Integer(opening.Section);
            page.Text(number, PageWriter.Margin, flow.Y, 11, page.Fonts.Bold);
            page.Text(opening.SectionTitle, PageWriter.Margin + 30, flow.Y, 11);
            page.TextRight(opening.Label, page.Width - PageWriter.Margin, flow.Y, 11);
            page.StrokeColour(180, 180, 180);
            double dotsFrom = PageWriter.Margin + 36 + page.TextWidth(opening.SectionTitle, page.Fonts.Regular, 11);
            page.Line(dotsFrom, flow.Y + 1, page.Width - PageWriter.Margin - 30, flow.Y + 1, 0.4);
            page.ResetColour();
            flow.Space(22);
        }
    }

    private static void Body(PageWriter page, ManualPage planned, DemoText text, DemoRandom random, ManualSpec spec)
    {
        var flow = new TextFlow(page, page.Top - 10);
        if (planned.OpensSection)
        {
            flow.Heading(DemoNumber.Integer(planned.Section) + "   " + planned.SectionTitle, 18);
            flow.Space(8);
        }

        string subNumber = DemoNumber.Integer(planned.Section) + "." + DemoNumber.Integer(random.Next(1, 9));
        switch (planned.Kind)
        {
            case ManualPageKind.Procedure:
                Procedure(flow, subNumber, text, random);
                break;
            case ManualPageKind.Table:
                TablePage(page, flow, subNumber, text, random);
                break;
            case ManualPageKind.Schematic:
                SchematicPage(page, flow, subNumber, text, random, spec);
                break;
            case ManualPageKind.PhotoPng:
            case ManualPageKind.PhotoJpeg:
                PhotoPage(page, flow, subNumber, text, random, spec, planned.Kind == ManualPageKind.PhotoPng);
                break;
            default:
                TextPage(flow, subNumber, text, random, planned.Amended ? planned.Seed : null);
                break;
        }
    }

    private static void TextPage(TextFlow flow, string subNumber, DemoText text, DemoRandom random, ulong? amendmentSeed)
    {
        string[] aspects = ["general", "checks", "settings", "operation", "records", "hazards", "access"];
        int sub = 0;
        while (flow.Remaining > 90)
        {
            flow.Heading(subNumber + "." + DemoNumber.Integer(++sub) + "  " + Capitalise(text.Equipment()) + ": " + random.Pick(aspects), 11);
            flow.Space(4);
            for (int paragraph = random.Next(1, 4); paragraph > 0; paragraph--)
            {
                string body = text.Paragraph(random.Next(3, 6));
                if (amendmentSeed is ulong seed)
                {
                    // The scripted edit: a sentence is added, drawn from its own stream so the rest of
                    // the page keeps its words.
                    amendmentSeed = null;
                    body = new DemoText(new DemoRandom(~seed), text.Topic, text.Site).Amendment() + " " + body;
                }

                if (!flow.Paragraph(body))
                {
                    return;
                }
            }

            flow.Space(6);
        }
    }

    private static void Procedure(TextFlow flow, string subNumber, DemoText text, DemoRandom random)
    {
        flow.Heading("Procedure " + subNumber + ": " + random.Pick(text.Words.Procedures), 12);
        flow.Space(4);
        flow.Paragraph(text.Paragraph(2));
        flow.Boxed("WARNING", "Isolate, lock off and prove dead before work starts. " + text.Sentence(), 255, 236, 200);
        var steps = text.ProcedureSteps(random.Next(6, 12));
        for (int step = 0; step < steps.Count; step++)
        {
            if (!flow.Numbered(DemoNumber.Integer(step + 1) + ".", steps[step]))
            {
                return;
            }
        }

        flow.Space(6);
        while (flow.Paragraph(text.Paragraph(random.Next(2, 4))))
        {
        }
    }

    private static void TablePage(PageWriter page, TextFlow flow, string subNumber, DemoText text, DemoRandom random)
    {
        var (title, columns, header, rows) = random.Next(3) switch
        {
            0 => ("Maintenance schedule", new double[] { 220, 80, 110, 73 }, new[] { "Task", "Interval", "Responsible", "Record" },
                text.Words.Tasks.Select(task => (IReadOnlyList<string>)[task.Task, "Every " + task.Interval, text.Role(), "Form " + DemoNumber.Integer(random.Next(100, 999))]).ToList()),
            1 => ("Fault finding", new double[] { 130, 150, 203 }, new[] { "Symptom", "Likely cause", "Action" },
                text.Words.Faults.Select(fault => (IReadOnlyList<string>)[fault.Symptom, fault.Cause, fault.Action]).ToList()),
            _ => ("Equipment register", new double[] { 70, 210, 120, 83 }, new[] { "Tag", "Description", "Location", "Normal reading" },
                Enumerable.Range(0, random.Next(6, 12)).Select(row => (IReadOnlyList<string>)[Tag(random), Capitalise(text.Equipment()) + " " + text.Part(), text.Site + " " + random.Pick(["plant room", "yard", "chamber", "kiosk"]), text.Reading()]).ToList()),
        };
        flow.Heading(subNumber + "  " + title, 12);
        flow.Space(4);
        flow.Paragraph(text.Paragraph(2));
        if (TableDrawer.Measure(page, columns, header, rows, 8.5) < flow.Remaining - 10)
        {
            double bottom = TableDrawer.Draw(page, PageWriter.Margin, flow.Y, columns, header, rows);
            flow.MoveTo(bottom - 14);
        }

        while (flow.Paragraph(text.Paragraph(random.Next(2, 4))))
        {
        }
    }

    private static void SchematicPage(PageWriter page, TextFlow flow, string subNumber, DemoText text, DemoRandom random, ManualSpec spec)
    {
        flow.Heading(subNumber + "  Process arrangement", 12);
        flow.Space(4);
        flow.Paragraph(text.Paragraph(3));
        double height = 260;
        double bottom = flow.Y - height;
        page.Rectangle(PageWriter.Margin, bottom, page.ContentWidth, height, 0.5);
        SchematicDrawer.Process(page, PageWriter.Margin + 10, bottom + 10, page.ContentWidth - 20, height - 20, random, spec.Topic);
        page.Text("Figure " + subNumber + ": process arrangement, " + spec.Site + " (not to scale)", PageWriter.Margin, bottom - 14, 9, page.Fonts.Italic);
        flow.MoveTo(bottom - 30);
        while (flow.Paragraph(text.Paragraph(random.Next(2, 4))))
        {
        }
    }

    private static void PhotoPage(PageWriter page, TextFlow flow, string subNumber, DemoText text, DemoRandom random, ManualSpec spec, bool png)
    {
        flow.Heading(subNumber + "  Site arrangement", 12);
        flow.Space(4);
        flow.Paragraph(text.Paragraph(3));
        var photo = SitePhotoBuilder.Paint(random);
        double width = page.ContentWidth * 0.8;
        double height = width * SitePhotoBuilder.Height / SitePhotoBuilder.Width;
        double left = PageWriter.Margin + page.ContentWidth * 0.1;
        double bottom = flow.Y - height;
        if (png)
        {
            page.Png(photo.EncodePng(), left, bottom, width, height);
        }
        else
        {
            page.Jpeg(photo.EncodeJpeg(82), left, bottom, width, height);
        }

        page.Text("Figure " + subNumber + ": " + Capitalise(text.Equipment()) + " at " + spec.Site, left, bottom - 14, 9, page.Fonts.Italic);
        flow.MoveTo(bottom - 30);
        while (flow.Paragraph(text.Paragraph(random.Next(2, 4))))
        {
        }
    }

    private static void Appendix(PageWriter page, ManualPage planned, DemoText text, DemoRandom random)
    {
        var flow = new TextFlow(page, page.Top - 10);
        if (planned.OpensSection)
        {
            flow.Heading("Appendix   Records and registers", 18);
            flow.Space(8);
        }

        flow.Heading(planned.Label + "  " + (planned.OpensSection ? "Equipment register" : "Contacts and call-out"), 12);
        flow.Space(6);
        var rows = new List<IReadOnlyList<string>>();
        for (int row = random.Next(12, 20); row > 0; row--)
        {
            rows.Add(planned.OpensSection
                ? [Tag(random), Capitalise(text.Equipment()), text.Part(), text.Reading()]
                : [Capitalise(text.Role()), text.Person(), "01632 960" + DemoNumber.Integer(random.Next(100, 1000)), random.Pick(["office hours", "24 hours", "standby rota"])]);
        }

        string[] header = planned.OpensSection ? ["Tag", "Item", "Part", "Normal reading"] : ["Role", "Name", "Telephone", "Cover"];
        double[] columns = [90, 150, 120, 123];
        if (TableDrawer.Measure(page, columns, header, rows, 8.5) > flow.Remaining)
        {
            rows.RemoveRange(8, rows.Count - 8);
        }

        TableDrawer.Draw(page, PageWriter.Margin, flow.Y, columns, header, rows);
    }

    private static string Tag(DemoRandom random) =>
        random.Pick(["P", "V", "LT", "FT", "PT", "AT", "M"]) + "-" + DemoNumber.Integer(random.Next(100, 999));

    private static string Capitalise(string text) => char.ToUpperInvariant(text[0]) + text[1..];
}
