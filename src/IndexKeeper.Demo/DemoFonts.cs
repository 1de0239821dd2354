using UglyToad.PdfPig.Fonts.Standard14Fonts;
using UglyToad.PdfPig.Writer;

namespace IndexKeeper.Demo;

/// <summary>The standard 14 fonts a demo document uses, always added in the same order so the object
/// layout of every file is the same from run to run.</summary>
internal sealed class DemoFonts
{
    private readonly Dictionary<PdfDocumentBuilder.AddedFont, Standard14Font> faces = [];

    public DemoFonts(PdfDocumentBuilder builder)
    {
        Regular = Add(builder, Standard14Font.Helvetica);
        Bold = Add(builder, Standard14Font.HelveticaBold);
        Italic = Add(builder, Standard14Font.HelveticaOblique);
        Typed = Add(builder, Standard14Font.Courier);
    }

    public PdfDocumentBuilder.AddedFont Regular { get; }

    public PdfDocumentBuilder.AddedFont Bold { get; }

    public PdfDocumentBuilder.AddedFont Italic { get; }

    /// <summary>A typewriter face for values filled into forms.</summary>
    public PdfDocumentBuilder.AddedFont Typed { get; }

    public double Measure(string text, PdfDocumentBuilder.AddedFont font, double size) =>
        Standard14Widths.Measure(faces[font], text, size);

    private PdfDocumentBuilder.AddedFont Add(PdfDocumentBuilder builder, Standard14Font face)
    {
        var font = builder.AddStandard14Font(face);
        faces[font] = face;
        return font;
    }
}
