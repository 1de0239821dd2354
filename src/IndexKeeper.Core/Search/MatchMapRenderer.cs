using IndexKeeper.Core.Documents;
using SkiaSharp;

namespace IndexKeeper.Core.Search;

/// <summary>
/// Draws a match map as PNG: the page's word boxes in light grey and, over them, the region each query
/// token matched, one colour per token. A thin adapter over SkiaSharp; a rendered page can replace the
/// word boxes later.
/// </summary>
public static class MatchMapRenderer
{
    private static readonly SKColor Paper = SKColors.White;
    private static readonly SKColor WordFill = new(0xE6, 0xE6, 0xE6);
    private static readonly SKColor WordEdge = new(0xB4, 0xB4, 0xB4);

    /// <param name="pageWidth">Page width in page units (the coordinates of the boxes).</param>
    /// <param name="tokenRegions">The matched region of each query token, in query order.</param>
    /// <param name="widthPixels">Width of the image; the height keeps the page's proportions.</param>
    public static void WritePng(Stream destination, float pageWidth, float pageHeight, IReadOnlyList<PageBox> wordBoxes, IReadOnlyList<PageBox> tokenRegions, int widthPixels = 800)
    {
        ArgumentNullException.ThrowIfNull(destination);
        ArgumentNullException.ThrowIfNull(wordBoxes);
        ArgumentNullException.ThrowIfNull(tokenRegions);
        if (!(pageWidth > 0) || !(pageHeight > 0))
        {
            throw new ArgumentException($"The page size {pageWidth} × {pageHeight} is not positive.", nameof(pageWidth));
        }

        ArgumentOutOfRangeException.ThrowIfLessThan(widthPixels, 16);
        ArgumentOutOfRangeException.ThrowIfGreaterThan(widthPixels, 8192);
        var scale = widthPixels / pageWidth;
        var heightPixels = Math.Max(1, (int)Math.Round(pageHeight * scale));
        using var surface = SKSurface.Create(new SKImageInfo(widthPixels, heightPixels, SKColorType.Rgba8888, SKAlphaType.Premul));
        var canvas = surface.Canvas;
        canvas.Clear(Paper);
        using var fill = new SKPaint { Style = SKPaintStyle.Fill, IsAntialias = true };
        using var edge = new SKPaint { Style = SKPaintStyle.Stroke, IsAntialias = true, StrokeWidth = 1 };

        fill.Color = WordFill;
        edge.Color = WordEdge;
        foreach (var box in wordBoxes)
        {
            var rectangle = ToPixels(box, pageHeight, scale);
            canvas.DrawRect(rectangle, fill);
            canvas.DrawRect(rectangle, edge);
        }

        edge.StrokeWidth = 2;
        for (var token = 0; token < tokenRegions.Count; token++)
        {
            var colour = TokenColour(token);
            var rectangle = ToPixels(tokenRegions[token], pageHeight, scale);
            fill.Color = colour.WithAlpha(110);
            edge.Color = colour;
            canvas.DrawRect(rectangle, fill);
            canvas.DrawRect(rectangle, edge);
        }

        using var image = surface.Snapshot();
        using var png = image.Encode(SKEncodedImageFormat.Png, 100);
        png.SaveTo(destination);
    }

    /// <summary>Hues a golden angle apart, so neighbouring tokens never share a colour.</summary>
    internal static SKColor TokenColour(int token) => SKColor.FromHsv((float)(token * 137.508 % 360), 85, 85);

    // Page coordinates have their origin at the bottom left; pixels at the top left.
    private static SKRect ToPixels(PageBox box, float pageHeight, float scale) =>
        new(box.Left * scale, (pageHeight - box.Top) * scale, box.Right * scale, (pageHeight - box.Bottom) * scale);
}
