using System.Globalization;
using IndexKeeper.Demo;

namespace IndexKeeper.Churn.Store;

/// <summary>
/// Makes the documents of the simulated drive from the demo store's builders: every document named by a
/// serial number, so the same seed gives the same documents in the same order.
/// </summary>
internal sealed class DocumentFactory(int seed)
{
    private static readonly (DemoTopic Topic, string Subject)[] Subjects =
    [
        (DemoTopic.PumpStation, "pump station"), (DemoTopic.Chlorination, "chlorination plant"),
        (DemoTopic.Valves, "valve maintenance"), (DemoTopic.Reservoir, "service reservoir"),
    ];

    private static readonly ScanLayout[] Layouts = [ScanLayout.FieldSheet, ScanLayout.LogPage, ScanLayout.DeliveryNote];

    private int serial;

    public DemoRandom Random(string purpose) => DemoRandom.For(seed, purpose);

    public (string Folder, string Name, SimDocument Document) Manual(int pages)
    {
        var n = Next();
        var (topic, subject) = Subjects[n % Subjects.Length];
        var site = DemoVocabulary.Sites[n % DemoVocabulary.Sites.Count];
        var code = "HWA-OM-" + (500 + n).ToString(CultureInfo.InvariantCulture);
        var spec = new ManualSpec(code, site + " " + subject, topic, site, ((char)('A' + n % 5)).ToString(), DemoVocabulary.People[n % DemoVocabulary.People.Count], new DateOnly(2024, 1 + n % 12, 1 + n % 27), pages);
        var document = new ManualDocument(spec, ManualPlanner.Plan(spec, Random("manual/" + code)));
        return ("manuals/" + subject.Replace(' ', '-'), code + " " + spec.Title + ".pdf", document);
    }

    public (string Folder, string Name, SimDocument Document) Deck(int slides)
    {
        var n = Next();
        var (topic, subject) = Subjects[n % Subjects.Length];
        var site = DemoVocabulary.Sites[(n + 1) % DemoVocabulary.Sites.Count];
        var spec = new DeckSpec("HWA-BR-" + n.ToString("D3", CultureInfo.InvariantCulture), "Briefing: " + subject + " at " + site, topic, site, DemoVocabulary.People[(n + 2) % DemoVocabulary.People.Count], new DateOnly(2026, 1 + n % 3, 2 + n % 25));
        var random = Random("deck/" + spec.Code);
        var document = new DeckDocument(spec, Enumerable.Range(0, slides).Select(_ => random.NextUInt64()));
        return ("briefings", spec.Code + " " + spec.Title.Replace(':', ' ') + ".pdf", document);
    }

    public (string Folder, string Name, SimDocument Document) Report(int pages)
    {
        var n = Next();
        var month = new DateOnly(2023, 1, 1).AddMonths(n);
        var spec = StorePlan.Report(month.Year, month.Month, n, pages) with { Code = "HWA-RPT-" + n.ToString("D4", CultureInfo.InvariantCulture) };
        var document = new WholeDocument("report", spec.Code, pages, ".pdf", hasMetadata: true, (random, metadata) =>
        {
            var info = ReportBuilder.Info(spec);
            return ReportBuilder.Render(spec, random, metadata == 0 ? info : info with { Title = info.Title + " (approved " + metadata.ToString(CultureInfo.InvariantCulture) + ")", Author = "Operations directorate" });
        });
        return (StorePlan.ReportFolder(spec.Year), spec.Code + " " + StorePlan.ReportFileName(spec), document);
    }

    public (string Folder, string Name, SimDocument Document) Form()
    {
        var n = Next();
        var (topic, subject) = Subjects[n % Subjects.Length];
        var site = DemoVocabulary.Sites[(n + 2) % DemoVocabulary.Sites.Count];
        var date = new DateOnly(2026, 1, 1).AddDays(n % 60);
        var spec = new FormSpec("IF-" + n.ToString("D4", CultureInfo.InvariantCulture), char.ToUpperInvariant(subject[0]) + subject[1..] + " check", topic, site, date, DemoVocabulary.People[(n * 3) % DemoVocabulary.People.Count], 1 + n % 2);
        var document = new WholeDocument("form", spec.Code, spec.PageCount, ".pdf", hasMetadata: false, (random, _) => FormBuilder.Render(spec, random));
        return ("inspections/" + date.ToString("yyyy-MM", CultureInfo.InvariantCulture), spec.Code + " " + site + ".pdf", document);
    }

    public (string Folder, string Name, SimDocument Document) Drawing()
    {
        var n = Next();
        var (topic, subject) = Subjects[n % Subjects.Length];
        var site = DemoVocabulary.Sites[(n + 3) % DemoVocabulary.Sites.Count];
        var spec = new DrawingSpec("HWA-DRG-" + (2000 + n).ToString(CultureInfo.InvariantCulture), site + " " + subject + " arrangement", topic, site, "A", new DateOnly(2025, 1 + n % 12, 3), DemoVocabulary.People[n % DemoVocabulary.People.Count], 1 + n % 3);
        var document = new WholeDocument("drawing", spec.Number, spec.Sheets, ".pdf", hasMetadata: false, (random, _) => DrawingBuilder.Render(spec, random));
        return ("drawings", spec.Number + " " + spec.Title + ".pdf", document);
    }

    public (string Folder, string Name, SimDocument Document) Scan()
    {
        var n = Next();
        var (format, extension, pages) = (n % 9) switch
        {
            8 => (ScanFormat.Tiff, ".tif", 3),
            < 4 => (ScanFormat.Png, ".png", 1),
            _ => (ScanFormat.Jpeg, ".jpg", 1),
        };
        var name = "scan-" + n.ToString("D4", CultureInfo.InvariantCulture) + extension;
        var spec = new ScanSpec(name, format, Layouts[n % Layouts.Length], pages);
        var document = new WholeDocument("scan", name, pages, extension, hasMetadata: false, (random, _) => spec.Build(random));
        return ("field-scans/2026-" + (1 + n % 3).ToString("D2", CultureInfo.InvariantCulture), name, document);
    }

    private int Next() => serial++;
}
