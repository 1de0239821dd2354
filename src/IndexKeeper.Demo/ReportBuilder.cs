namespace IndexKeeper.Demo;

/// <summary>Monthly operations reports: key figures, charts of daily values drawn from lines, tables of
/// incidents, maintenance and samples, and site notes.</summary>
internal static class ReportBuilder
{
    private static readonly string[] Zones = ["North zone", "Town zone", "Moorland zone"];

    public static DemoPdfInfo Info(ReportSpec spec) =>
        DemoPdfInfo.Issued(spec.Title, spec.Author, "Operations report " + spec.Code, spec.Issued, new TimeOnly(10, 30));

    public static byte[] Render(ReportSpec spec, DemoRandom random, DemoPdfInfo info)
    {
        var composer = new PdfComposer("report/" + spec.Code, info);
        int days = DateTime.DaysInMonth(spec.Year, spec.Month);
        Action<PageWriter, TextFlow, DemoText, DemoRandom>[] sections =
        [
            (page, flow, text, pageRandom) => Summary(page, flow, text, pageRandom, spec),
            (page, flow, text, pageRandom) => ChartPage(page, flow, text, "Water into supply", "Ml/d", 1, Walk(pageRandom, days, 3, 60, 240, 8)),
            (page, flow, text, pageRandom) => ChartPage(page, flow, text, "Free chlorine residual at the zone inlets", "mg/l", 2, Walk(pageRandom, days, 3, 30, 90, 4)),
            (page, flow, text, pageRandom) => Incidents(page, flow, text, pageRandom, spec, days),
            (page, flow, text, pageRandom) => ChartPage(page, flow, text, "Service reservoir levels", "% full", 0, Walk(pageRandom, days, 3, 45, 98, 5)),
            (page, flow, text, pageRandom) => Maintenance(page, flow, text, pageRandom, days, spec),
            (page, flow, text, pageRandom) => Samples(page, flow, text, pageRandom),
            (page, flow, text, pageRandom) => Notes(flow, text, pageRandom),
        ];

        for (int pageNumber = 1; pageNumber <= spec.PageCount; pageNumber++)
        {
            var page = composer.AddPage(PaperSize.A4);
            var pageRandom = random.Fork();
            var topic = (DemoTopic)(pageNumber % 4);
            var text = new DemoText(pageRandom, topic, pageRandom.Pick(DemoVocabulary.Sites));
            page.Furniture(
                "Harrowmere Water Authority  -  Operations",
                spec.Code,
                spec.Title,
                "Page " + DemoNumber.Integer(pageNumber) + " of " + DemoNumber.Integer(spec.PageCount));
            var flow = new TextFlow(page, page.Top - 10);
            sections[(pageNumber - 1) % sections.Length](page, flow, text, pageRandom);
        }

        return composer.Build();
    }

    private static void Summary(PageWriter page, TextFlow flow, DemoText text, DemoRandom random, ReportSpec spec)
    {
        flow.Heading(spec.Title, 18);
        flow.Space(4);
        page.Text("Prepared by " + spec.Author + ", issued " + DemoNumber.Date(spec.Issued), PageWriter.Margin, flow.Y - 10, 10, page.Fonts.Italic);
        flow.Space(30);
        flow.Heading("1  Summary", 13);
        flow.Space(4);
        flow.Paragraph(text.Paragraph(4));
        flow.Heading("2  Key figures", 13);
        flow.Space(4);
        string[][] rows =
        [
            ["Average water into supply", DemoNumber.Fixed(random.Next(180, 260), 1) + " Ml/d", DemoNumber.Fixed(random.Next(180, 260), 1) + " Ml/d"],
            ["Peak day", DemoNumber.Fixed(random.Next(260, 320), 1) + " Ml/d", DemoNumber.Fixed(random.Next(260, 320), 1) + " Ml/d"],
            ["Samples meeting the chlorine standard", DemoNumber.Fixed(random.Next(9850, 10000), 2) + " %", DemoNumber.Fixed(random.Next(9850, 10000), 2) + " %"],
            ["Bursts repaired", DemoNumber.Integer(random.Next(4, 30)), DemoNumber.Integer(random.Next(4, 30))],
            ["Customer contacts about water quality", DemoNumber.Integer(random.Next(2, 25)), DemoNumber.Integer(random.Next(2, 25))],
            ["Pump availability", DemoNumber.Fixed(random.Next(950, 1000), 1) + " %", DemoNumber.Fixed(random.Next(950, 1000), 1) + " %"],
        ];
        double bottom = TableDrawer.Draw(page, PageWriter.Margin, flow.Y, [260, 110, 113], ["Measure", "This month", "Same month last year"], rows, 9);
        flow.MoveTo(bottom - 16);
        while (flow.Paragraph(text.Paragraph(random.Next(2, 4))))
        {
        }
    }

    private static void ChartPage(PageWriter page, TextFlow flow, DemoText text, string title, string unit, int decimals, int[][] values)
    {
        flow.Heading(title, 13);
        flow.Space(4);
        flow.Paragraph(text.Paragraph(3));
        byte[][] colours = [[28, 92, 170], [200, 80, 40], [60, 140, 70]];
        var series = values.Select((line, index) => new ChartSeries(Zones[index], line, colours[index][0], colours[index][1], colours[index][2])).ToList();
        double height = 280;
        double bottom = flow.Y - height - 20;
        ChartDrawer.Draw(page, PageWriter.Margin, bottom, page.ContentWidth, height, "Daily values, " + title.ToLowerInvariant(), unit, decimals, series);
        flow.MoveTo(bottom - 20);
        flow.Paragraph(text.Paragraph(3));
    }

    private static void Incidents(PageWriter page, TextFlow flow, DemoText text, DemoRandom random, ReportSpec spec, int days)
    {
        flow.Heading("Incidents and events", 13);
        flow.Space(4);
        flow.Paragraph(text.Paragraph(2));
        var rows = new List<IReadOnlyList<string>>();
        for (int row = random.Next(5, 10); row > 0; row--)
        {
            var words = text.Words.Faults[random.Next(text.Words.Faults.Count)];
            rows.Add([
                DemoNumber.Date(new DateOnly(spec.Year, spec.Month, random.Next(1, days + 1))), random.Pick(DemoVocabulary.Sites),
                words.Symptom, words.Action, random.Pick(["closed", "open", "monitoring"]),
            ]);
        }

        double bottom = TableDrawer.Draw(page, PageWriter.Margin, flow.Y, [64, 72, 110, 177, 60], ["Date", "Site", "Event", "Action taken", "Status"], rows);
        flow.MoveTo(bottom - 16);
        flow.Paragraph(text.Paragraph(2));
    }

    private static void Maintenance(PageWriter page, TextFlow flow, DemoText text, DemoRandom random, int days, ReportSpec spec)
    {
        flow.Heading("Planned maintenance completed", 13);
        flow.Space(4);
        var rows = new List<IReadOnlyList<string>>();
        for (int row = random.Next(8, 16); row > 0; row--)
        {
            var task = text.Words.Tasks[random.Next(text.Words.Tasks.Count)];
            rows.Add([
                "WO-" + DemoNumber.Integer(random.Next(20000, 39999)), random.Pick(DemoVocabulary.Sites), task.Task,
                text.Person(), DemoNumber.Date(new DateOnly(spec.Year, spec.Month, random.Next(1, days + 1))),
            ]);
        }

        double bottom = TableDrawer.Draw(page, PageWriter.Margin, flow.Y, [64, 74, 175, 90, 80], ["Work order", "Site", "Task", "Completed by", "Date"], rows);
        flow.MoveTo(bottom - 16);
        flow.Paragraph(text.Paragraph(3));
    }

    private static void Samples(PageWriter page, TextFlow flow, DemoText text, DemoRandom random)
    {
        flow.Heading("Water quality samples", 13);
        flow.Space(4);
        flow.Paragraph(text.Paragraph(2));
        var rows = new List<IReadOnlyList<string>>();
        for (int row = random.Next(10, 18); row > 0; row--)
        {
            rows.Add([
                "S" + DemoNumber.Integer(random.Next(10000, 99999)), random.Pick(DemoVocabulary.Sites),
                DemoNumber.Fixed(random.Next(20, 95), 2), DemoNumber.Fixed(random.Next(5, 60), 2),
                DemoNumber.Integer(random.Chance(4) ? 1 : 0), random.Pick(["pass", "pass", "pass", "resample"]),
            ]);
        }

        double bottom = TableDrawer.Draw(page, PageWriter.Margin, flow.Y, [70, 90, 90, 80, 73, 80], ["Sample", "Site", "Free chlorine mg/l", "Turbidity NTU", "Coliforms /100 ml", "Result"], rows);
        flow.MoveTo(bottom - 16);
        flow.Paragraph(text.Paragraph(2));
    }

    private static void Notes(TextFlow flow, DemoText text, DemoRandom random)
    {
        flow.Heading("Site notes", 13);
        flow.Space(4);
        while (flow.Remaining > 60)
        {
            flow.Heading(random.Pick(DemoVocabulary.Sites), 11);
            flow.Space(2);
            if (!flow.Paragraph(text.Paragraph(random.Next(3, 6))))
            {
                return;
            }
        }
    }

    /// <summary>Daily values for several lines: bounded random walks in integers.</summary>
    private static int[][] Walk(DemoRandom random, int days, int lines, int low, int high, int step)
    {
        var result = new int[lines][];
        for (int line = 0; line < lines; line++)
        {
            result[line] = new int[days];
            int value = random.Next(low + (high - low) / 4, high - (high - low) / 4);
            for (int day = 0; day < days; day++)
            {
                value = Math.Clamp(value + random.Next(-step, step + 1), low, high);
                result[line][day] = value;
            }
        }

        return result;
    }
}
