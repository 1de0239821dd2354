namespace IndexKeeper.Demo;

/// <summary>A page size in PDF points (1/72 inch). ISO 216's A sizes rounded to whole points, as the demo's
/// documents are drawn: A4 is 210 × 297 mm, 595.28 × 841.89 points.</summary>
internal readonly record struct PaperSize(double Width, double Height)
{
    public static PaperSize A4 => new(595, 842);

    public static PaperSize A3 => new(842, 1191);

    public PaperSize Landscape => new(Height, Width);
}
