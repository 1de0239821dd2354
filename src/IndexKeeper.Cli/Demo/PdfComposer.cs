using UglyToad.PdfPig.Writer;

namespace IndexKeeper.Cli.Demo;

/// <summary>One PDF being written: the builder, its fonts, its metadata and a cache of word widths shared
/// by its pages. Build() returns bytes that depend only on what was drawn.</summary>
internal sealed class PdfComposer
{
    private readonly PdfDocumentBuilder builder = new();
    private readonly Dictionary<(string Text, PdfDocumentBuilder.AddedFont Font, double Size), double> widths = [];
    private readonly string identity;

    public PdfComposer(string identity, DemoPdfInfo info)
    {
        this.identity = identity;
        Fonts = DemoFonts.AddTo(builder);
        var documentInformation = builder.DocumentInformation;
        documentInformation.Title = info.Title;
        documentInformation.Author = info.Author;
        documentInformation.Subject = info.Subject;
        documentInformation.Creator = "Harrowmere Water Authority document office";
        documentInformation.Producer = "Harrowmere Water Authority document office";
        documentInformation.CreationDate = info.CreationDate;
        documentInformation.ModifiedDate = info.ModifiedDate;
    }

    public DemoFonts Fonts { get; }

    public int PageCount { get; private set; }

    public PageWriter AddPage(double width, double height)
    {
        PageCount++;
        return new PageWriter(builder.AddPage(width, height), Fonts, MeasureWidth);
    }

    public byte[] Build() => PdfTrailerId.MakeDeterministic(builder.Build(), identity);

    private double MeasureWidth(PdfPageBuilder page, string text, PdfDocumentBuilder.AddedFont font, double size)
    {
        if (text.Length == 0)
        {
            return 0;
        }

        if (!widths.TryGetValue((text, font, size), out double width))
        {
            var letters = page.MeasureText(text, size, new UglyToad.PdfPig.Core.PdfPoint(0, 0), font);
            width = letters[^1].EndBaseLine.X - letters[0].StartBaseLine.X;
            widths[(text, font, size)] = width;
        }

        return width;
    }
}
