namespace IndexKeeper.Demo;

/// <summary>
/// The demo store of the Harrowmere Water Authority as data: every document's spec, path and page count.
/// Each document draws from its own seeded stream, named after the document.
/// </summary>
internal sealed class StorePlan
{
    public const string SharedDrive = "shared-drive";
    public const string FieldScans = "field-scans";

    private readonly int seed;

    private StorePlan(int seed)
    {
        this.seed = seed;
        Manuals =
        [
            (Manual("HWA-OM-101", "Kestrel Lane pump station", DemoTopic.PumpStation, "Kestrel Lane", "C", 0, new(2025, 6, 12), 58), "manuals/pump-stations"),
            (Manual("HWA-OM-102", "Brindle Hill booster station", DemoTopic.PumpStation, "Brindle Hill", "B", 1, new(2024, 11, 3), 44), "manuals/pump-stations"),
            (Manual("HWA-OM-201", "Ashby Road chlorination plant", DemoTopic.Chlorination, "Ashby Road", "D", 2, new(2025, 2, 20), 54), "manuals/chlorination"),
            (Manual("HWA-OM-202", "Hypochlorite dosing at Wyke End", DemoTopic.Chlorination, "Wyke End", "A", 3, new(2025, 9, 8), 28), "manuals/chlorination"),
            (Manual("HWA-OM-301", "Network valve maintenance", DemoTopic.Valves, "Tanners Gate", "C", 4, new(2023, 4, 17), 40), "manuals/valves"),
            (Manual("HWA-OM-302", "Pressure reducing valves", DemoTopic.Valves, "Sallow Bank", "B", 5, new(2024, 1, 29), 24), "manuals/valves"),
            (Manual("HWA-OM-401", "Highfold service reservoir inspection and cleaning", DemoTopic.Reservoir, "Highfold", "E", 6, new(2025, 3, 14), 50), "manuals/reservoirs"),
            (Manual("HWA-OM-402", "Corran Moss service reservoir", DemoTopic.Reservoir, "Corran Moss", "A", 7, new(2022, 10, 5), 34), "manuals/reservoirs"),
        ];

        var forms = new List<(FormSpec, string)>();
        (string Title, DemoTopic Topic, string Site)[] checks =
        [
            ("Weekly pump station check", DemoTopic.PumpStation, "Kestrel Lane"),
            ("Chlorination plant daily check", DemoTopic.Chlorination, "Ashby Road"),
            ("Service reservoir inspection", DemoTopic.Reservoir, "Highfold"),
            ("Pressure reducing valve check", DemoTopic.Valves, "Sallow Bank"),
            ("Booster station check", DemoTopic.PumpStation, "Brindle Hill"),
        ];
        for (int index = 0; index < 10; index++)
        {
            var check = checks[index % checks.Length];
            int month = 1 + index / 5;
            var date = new DateOnly(2026, month, 5 + 4 * (index % 5));
            string code = "IF-" + DemoNumber.Integer(month).PadLeft(2, '0') + DemoNumber.Integer(index + 1).PadLeft(2, '0');
            var spec = new FormSpec(code, check.Title, check.Topic, check.Site, date, DemoVocabulary.People[(index * 3) % DemoVocabulary.People.Count], 1 + index % 2);
            forms.Add((spec, "inspections/2026-" + DemoNumber.Integer(month).PadLeft(2, '0') + "/" + code + " " + check.Site + " " + check.Title.ToLowerInvariant() + ".pdf"));
        }

        Forms = forms;

        int[] reportPages = [4, 6, 3, 8, 5, 7, 4, 6];
        var reports = new List<(ReportSpec, string)>();
        for (int index = 0; index < reportPages.Length; index++)
        {
            var month = new DateOnly(2025, 7, 1).AddMonths(index);
            reports.Add((Report(month.Year, month.Month, index, reportPages[index]), ReportFolder(month.Year)));
        }

        Reports = reports;

        Drawings =
        [
            new("HWA-DRG-1001", "Town zone distribution network", DemoTopic.Valves, "Tanners Gate", "F", new(2025, 5, 2), "D. Firth", 3),
            new("HWA-DRG-1002", "Kestrel Lane pump station general arrangement", DemoTopic.PumpStation, "Kestrel Lane", "C", new(2024, 8, 19), "L. Moorcroft", 2),
            new("HWA-DRG-1003", "Ashby Road chlorination process", DemoTopic.Chlorination, "Ashby Road", "B", new(2025, 1, 9), "D. Firth", 2),
            new("HWA-DRG-1004", "Highfold reservoir pipework", DemoTopic.Reservoir, "Highfold", "A", new(2023, 6, 30), "E. Tanaka-Reid", 1),
            new("HWA-DRG-1005", "Sallow Bank pressure reducing valve chamber", DemoTopic.Valves, "Sallow Bank", "D", new(2025, 10, 21), "L. Moorcroft", 2),
        ];

        Scans =
        [
            (new("scan-0001.png", ScanFormat.Png, ScanLayout.FieldSheet, 1), "2026-01"),
            (new("scan-0002.png", ScanFormat.Png, ScanLayout.LogPage, 1), "2026-01"),
            (new("scan-0003.jpg", ScanFormat.Jpeg, ScanLayout.DeliveryNote, 1), "2026-01"),
            (new("scan-0004.jpg", ScanFormat.Jpeg, ScanLayout.FieldSheet, 1), "2026-01"),
            (new("scan-0005.png", ScanFormat.Png, ScanLayout.FieldSheet, 1), "2026-02"),
            (new("scan-0006.jpg", ScanFormat.Jpeg, ScanLayout.DeliveryNote, 1), "2026-02"),
            (new("scan-0007.png", ScanFormat.Png, ScanLayout.DeliveryNote, 1), "2026-02"),
            (new("scan-0008.jpg", ScanFormat.Jpeg, ScanLayout.LogPage, 1), "2026-02"),
            (new("reservoir-log-book.tif", ScanFormat.Tiff, ScanLayout.LogPage, 5), "2026-02"),
        ];
    }

    public IReadOnlyList<(ManualSpec Spec, string Folder)> Manuals { get; }

    public IReadOnlyList<(FormSpec Spec, string Path)> Forms { get; }

    public IReadOnlyList<(ReportSpec Spec, string Folder)> Reports { get; }

    public IReadOnlyList<DrawingSpec> Drawings { get; }

    public IReadOnlyList<(ScanSpec Spec, string Folder)> Scans { get; }

    public static StorePlan Create(int seed) => new(seed);

    public static string ReportFolder(int year) => "reports/" + DemoNumber.Integer(year);

    public static string ManualFileName(ManualSpec spec) => spec.Code + " " + spec.Title + ".pdf";

    public static string ReportFileName(ReportSpec spec) =>
        DemoNumber.Integer(spec.Year) + "-" + DemoNumber.Integer(spec.Month).PadLeft(2, '0') + " Monthly operations report.pdf";

    public static string DrawingFileName(DrawingSpec spec) => spec.Number + " " + spec.Title + ".pdf";

    /// <summary>Every file of the first day, in a fixed order.</summary>
    public IReadOnlyList<PlannedFile> Files()
    {
        var files = new List<PlannedFile>();
        foreach (var (spec, folder) in Manuals)
        {
            var pages = ManualPages(spec);
            files.Add(new(SharedDrive, folder + "/" + ManualFileName(spec), pages.Count, () => ManualBuilder.Render(spec, pages)));
        }

        foreach (var (spec, path) in Forms)
        {
            files.Add(new(SharedDrive, path, spec.PageCount, () => FormBuilder.Render(spec, Random("form/" + spec.Code))));
        }

        foreach (var (spec, folder) in Reports)
        {
            files.Add(new(SharedDrive, folder + "/" + ReportFileName(spec), spec.PageCount, () => RenderReport(spec, ReportBuilder.Info(spec))));
        }

        foreach (var spec in Drawings)
        {
            files.Add(new(SharedDrive, "drawings/" + DrawingFileName(spec), spec.Sheets, () => DrawingBuilder.Render(spec, Random("drawing/" + spec.Number))));
        }

        foreach (var (spec, folder) in Scans)
        {
            files.Add(new(FieldScans, folder + "/" + spec.Name, spec.PageCount, () => spec.Build(Random("scan/" + spec.Name))));
        }

        return files;
    }

    public IReadOnlyList<ManualPage> ManualPages(ManualSpec spec) => ManualPlanner.Plan(spec, Random("manual/" + spec.Code));

    public byte[] RenderReport(ReportSpec spec, DemoPdfInfo info) => ReportBuilder.Render(spec, Random("report/" + spec.Code), info);

    public DemoRandom Random(string purpose) => DemoRandom.For(seed, purpose);

    public static ReportSpec Report(int year, int month, int authorIndex, int pageCount) => new(
        "HWA-RPT-" + DemoNumber.Integer(year) + "-" + DemoNumber.Integer(month).PadLeft(2, '0'),
        year,
        month,
        DemoVocabulary.People[authorIndex % DemoVocabulary.People.Count],
        pageCount);

    private static ManualSpec Manual(string code, string title, DemoTopic topic, string site, string revision, int authorIndex, DateOnly issued, int pages) =>
        new(code, title, topic, site, revision, DemoVocabulary.People[authorIndex], issued, pages);
}
