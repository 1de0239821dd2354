using System.Globalization;
using IndexKeeper.Demo;

namespace IndexKeeper.Benchmarks;

/// <summary>
/// Plain works reports of the invented Harrowmere Water Authority for the benchmarks that need many real
/// PDFs: each page is a header, a title and lines of words drawn from a seeded generator, so the same
/// (document, page, revision) always gives the same page and any other revision gives a new page key.
/// Written through the demo's page writer, which is about a hundred times faster than the builder's own text layout.
/// </summary>
internal static class GeneratedReport
{
    private static readonly string[] Terms =
    [
        "inflow", "outflow", "turbidity", "chlorine", "residual", "pump", "valve", "sluice", "weir", "filter",
        "backwash", "sludge", "aeration", "settling", "tank", "reservoir", "main", "hydrant", "meter", "pressure",
        "reading", "sample", "station", "borehole", "intake", "screen", "dosing", "coagulant", "flocculation",
        "clarifier", "overflow", "culvert", "manhole", "sewer", "rising", "gravity", "telemetry", "alarm",
        "inspection", "defect", "repair", "replaced", "cleared", "serviced", "logged", "fitter", "operator",
        "supervisor", "shift", "duty", "permit", "isolation", "lockout", "gasket", "bearing", "impeller",
        "motor", "starter", "cable", "panel", "sensor", "probe", "calibrated", "drift", "leak", "burst",
        "flushing", "hardness", "nitrate", "colour", "odour", "complaint", "district", "zone", "north", "south",
        "east", "west", "upper", "lower", "kestrel", "brindle", "ashby", "highfold", "corran", "tanners", "wyke",
        "sallow", "pennock", "marlow", "harrowmere", "catchment", "rainfall", "level", "gauge", "flow", "rate",
    ];

    /// <summary>
    /// One PDF of <paramref name="pageRevisions"/>.Count pages; page i shows <paramref name="wordsPerPage"/>
    /// words of revision pageRevisions[i].
    /// </summary>
    public static byte[] Build(int document, IReadOnlyList<int> pageRevisions, int wordsPerPage)
    {
        var composer = new PdfComposer(
            $"benchmark-report-{document}",
            new DemoPdfInfo($"Works report {document}", "Harrowmere Water Authority", "Works report", "D:20260105090000Z", "D:20260105090000Z"));
        var size = wordsPerPage > 300 ? 5.5 : 9;
        var leading = size * 1.3;
        for (var p = 0; p < pageRevisions.Count; p++)
        {
            var page = composer.AddPage(PaperSize.A4);
            page.Furniture("Harrowmere Water Authority", $"Works report {document}", $"revision {pageRevisions[p]}", $"page {p + 1}");
            page.Text($"Works report {document}, part {p + 1}", PageWriter.Margin, page.Top - 20, 13, page.Fonts.Bold);
            var lines = page.Wrap(string.Join(' ', Words(document, p, pageRevisions[p], wordsPerPage)), page.ContentWidth, size, page.Fonts.Regular);
            page.Lines(lines, PageWriter.Margin, page.Top - 44, size, page.Fonts.Regular, leading);
        }

        return composer.Build();
    }

    private static IEnumerable<string> Words(int document, int page, int revision, int count)
    {
        var random = new Random(unchecked((document * 1_000_003) + (page * 7_919) + (revision * 104_729)));
        for (var i = 0; i < count; i++)
        {
            // One word in five is a reading, as in the tables of a real works report.
            yield return random.Next(5) == 0
                ? random.Next(10_000).ToString(CultureInfo.InvariantCulture)
                : Terms[random.Next(Terms.Length)];
        }
    }
}
