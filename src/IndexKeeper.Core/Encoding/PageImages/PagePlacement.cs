namespace IndexKeeper.Core.Encoding.PageImages;

/// <summary>
/// Where a raster of <see cref="SourceWidth"/>×<see cref="SourceHeight"/> pixels lands in the page graph's
/// input: input x = <see cref="OffsetX"/> + source x × <see cref="ScaleX"/> (and the same for y, both
/// measured from the top left).
/// </summary>
internal readonly record struct PagePlacement(int SourceWidth, int SourceHeight, double ScaleX, double ScaleY, double OffsetX, double OffsetY)
{
    /// <summary>Letterbox: one scale that fits the whole raster, centred; stretch: each side scaled to fill.</summary>
    public static PagePlacement Of(int sourceWidth, int sourceHeight, int inputWidth, int inputHeight, string fit)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(sourceWidth, 1);
        ArgumentOutOfRangeException.ThrowIfLessThan(sourceHeight, 1);
        var scaleX = (double)inputWidth / sourceWidth;
        var scaleY = (double)inputHeight / sourceHeight;
        if (fit == PageImageFit.Stretch)
        {
            return new PagePlacement(sourceWidth, sourceHeight, scaleX, scaleY, 0, 0);
        }

        var scale = Math.Min(scaleX, scaleY);
        return new PagePlacement(
            sourceWidth,
            sourceHeight,
            scale,
            scale,
            (inputWidth - (sourceWidth * scale)) / 2,
            (inputHeight - (sourceHeight * scale)) / 2);
    }

    /// <summary>The source interval (clipped to the raster) that input interval [from, to) of the x axis shows.</summary>
    public (double From, double To) SourceX(double from, double to) =>
        (Math.Clamp((from - OffsetX) / ScaleX, 0, SourceWidth), Math.Clamp((to - OffsetX) / ScaleX, 0, SourceWidth));

    public (double From, double To) SourceY(double from, double to) =>
        (Math.Clamp((from - OffsetY) / ScaleY, 0, SourceHeight), Math.Clamp((to - OffsetY) / ScaleY, 0, SourceHeight));
}
