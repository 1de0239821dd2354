using UglyToad.PdfPig.Writer;

namespace IndexKeeper.Demo;

/// <summary>One PDF being written: the builder, its fonts and its metadata. Build() returns bytes that
/// depend only on what was drawn.</summary>
/// <remarks>PdfPig's builder writes the standard 14 fonts without embedding them, so what a page names
/// depends only on what it draws, and a re-save changes no page. PDFsharp 6.2.4 was weighed: it embeds a
/// subset of a TrueType font shared by every page under a new random tag on each save (and needs font
/// files on Linux), which would give every page of a re-saved file a new page key.</remarks>
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

    public PageWriter AddPage(PaperSize size) => new(builder.AddPage(size.Width, size.Height), Fonts);

    public byte[] Build() => PdfTrailerId.MakeDeterministic(builder.Build(), identity);
}
