using System.Globalization;
using IndexKeeper.Demo;

namespace IndexKeeper.Churn.Store;

/// <summary>
/// Landscape briefing slides drawn with the demo's page writer: a title slide, then slides of bullets
/// with a bar chart now and then. A slide depends only on the deck's spec and its own seed (no running
/// slide numbers), so a slide can be edited, inserted or deleted alone.
/// </summary>
internal static class SlideDeckBuilder
{
    private const double Width = 842;
    private const double Height = 595;

    public static byte[] Render(DeckSpec spec, IReadOnlyList<ulong> slideSeeds, int metadataRevision)
    {
        var info = DemoPdfInfo.Issued(spec.Title + (metadataRevision > 0 ? " (reviewed " + metadataRevision.ToString(CultureInfo.InvariantCulture) + ")" : string.Empty), spec.Author, "Briefing " + spec.Code, spec.Date, new TimeOnly(14, 0));
        var composer = new PdfComposer("deck/" + spec.Code, info);
        for (var index = 0; index < slideSeeds.Count; index++)
        {
            var page = composer.AddPage(new PaperSize(Width, Height));
            var random = new DemoRandom(slideSeeds[index]);
            var text = new DemoText(random, spec.Topic, spec.Site);
            page.FillColour(20, 96, 110);
            page.Rectangle(0, Height - 70, Width, 70, 0, fill: true);
            page.FillColour(255, 255, 255);
            if (index == 0)
            {
                page.Text(spec.Title, 40, Height - 45, 24, page.Fonts.Bold);
                page.ResetColour();
                page.Text(spec.Site + "  -  " + spec.Author + "  -  " + DemoNumber.Date(spec.Date), 40, Height - 130, 16);
                page.Text(text.Sentence(), 40, Height - 170, 12, page.Fonts.Italic);
                continue;
            }

            page.Text(Capitalise(text.Equipment()) + ": " + random.Pick(text.Words.Procedures), 40, Height - 45, 20, page.Fonts.Bold);
            page.ResetColour();
            page.Text("Harrowmere Water Authority  -  " + spec.Code + "  " + spec.Title, 40, 20, 8);
            var chart = random.Chance(35);
            var textWidth = chart ? 420 : Width - 80;
            var y = Height - 110.0;
            for (var bullet = random.Next(3, 6); bullet > 0 && y > 80; bullet--)
            {
                page.Circle(46, y + 4, 5, fill: true);
                y = page.Lines(page.Wrap(text.Sentence(), textWidth - 20, 14, page.Fonts.Regular), 60, y, 14, page.Fonts.Regular, 18) - 14;
            }

            if (chart)
            {
                Bars(page, random, text);
            }
        }

        return composer.Build();
    }

    private static void Bars(PageWriter page, DemoRandom random, DemoText text)
    {
        double left = 500, bottom = 120, width = 300, height = 300;
        page.Line(left, bottom, left + width, bottom, 1);
        page.Line(left, bottom, left, bottom + height, 1);
        var bars = random.Next(4, 8);
        for (var bar = 0; bar < bars; bar++)
        {
            var value = random.Next(20, 100);
            page.FillColour(60, (byte)(110 + 15 * bar), 160);
            page.Rectangle(left + 12 + bar * (width - 24) / bars, bottom, (width - 24) / bars - 8, height * value / 100.0, 0, fill: true);
            page.ResetColour();
            page.TextCentred(DemoNumber.Integer(value), left + 12 + (bar + 0.5) * (width - 24) / bars - 4, bottom + height * value / 100.0 + 4, 9);
        }

        page.Text(text.Reading(), left, bottom - 20, 10, page.Fonts.Italic);
    }

    private static string Capitalise(string text) => char.ToUpperInvariant(text[0]) + text[1..];
}
