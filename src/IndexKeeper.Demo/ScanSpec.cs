namespace IndexKeeper.Demo;

/// <summary>One scanned document: a PNG or JPEG page, or a multi-page TIFF.</summary>
internal sealed record ScanSpec(string Name, ScanFormat Format, ScanLayout Layout, int PageCount)
{
    public const int JpegQuality = 78;

    public byte[] Build(DemoRandom random)
    {
        switch (Format)
        {
            case ScanFormat.Png:
                return ScanImageBuilder.Paint(random, Layout).EncodePng();
            case ScanFormat.Jpeg:
                return ScanImageBuilder.Paint(random, Layout).EncodeJpeg(JpegQuality);
            default:
                var pages = Enumerable.Range(0, PageCount).Select(_ => ScanImageBuilder.Paint(random.Fork(), Layout)).ToList();
                return ScanImageBuilder.MultiPageTiff(pages);
        }
    }
}
