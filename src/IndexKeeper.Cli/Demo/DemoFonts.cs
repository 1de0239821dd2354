using UglyToad.PdfPig.Fonts.Standard14Fonts;
using UglyToad.PdfPig.Writer;

namespace IndexKeeper.Cli.Demo;

/// <summary>The standard 14 fonts a demo document uses, always added in the same order so the object
/// layout of every file is the same from run to run.</summary>
internal sealed record DemoFonts(
    PdfDocumentBuilder.AddedFont Regular,
    PdfDocumentBuilder.AddedFont Bold,
    PdfDocumentBuilder.AddedFont Italic,
    PdfDocumentBuilder.AddedFont Typed)
{
    public static DemoFonts AddTo(PdfDocumentBuilder builder) => new(
        builder.AddStandard14Font(Standard14Font.Helvetica),
        builder.AddStandard14Font(Standard14Font.HelveticaBold),
        builder.AddStandard14Font(Standard14Font.HelveticaOblique),
        builder.AddStandard14Font(Standard14Font.Courier));
}
