using UglyToad.PdfPig.Writer;

namespace IndexKeeper.Demo;

/// <summary>One PDF being written: the builder, its fonts and its metadata. Build() returns bytes that
/// depend only on what was drawn.</summary>
internal sealed class PdfComposer
{
    private readonly PdfDocumentBuilder builder = new();
    private readonly string identity;

    public PdfComposer(string identity, DemoPdfInfo info)
    {
        this.identity = identity;
        Fonts = new DemoFonts(builder);
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

    public PageWriter AddPage(double width, double height)
    {
        return new PageWriter(builder.AddPage(width, height), Fonts);
    }

    public byte[] Build() => PdfTrailerId.MakeDeterministic(builder.Build(), identity);
}
