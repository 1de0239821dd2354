using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding.PageImages;
using SkiaSharp;

namespace IndexKeeper.Core.Search;

/// <summary>
/// Draws a match map as PNG: the page itself (<see cref="MapBackdrop"/>: drawn by poppler's pdftoppm, or
/// the page image decoded) or, when it cannot be drawn, its word boxes in light grey; over it the region
/// each query token matched, one colour per token. A thin adapter over SkiaSharp.
/// </summary>
public static class MatchMapRenderer
{
    private static readonly SKColor Paper = SKColors.White;
    private static readonly SKColor WordFill = new(0xE6, 0xE6, 0xE6);
    private static readonly SKColor WordEdge = new(0xB4, 0xB4, 0xB4);

    /// <summary>How long pdftoppm may take to draw one page of a map (it reads a file of the store).</summary>
    private static readonly TimeSpan DrawTimeout = TimeSpan.FromSeconds(60);

    /// <summary>pdftoppm, found and its version asked once per process; a failure is not kept, so the next map asks again.</summary>
    private static readonly Lazy<PdftoppmRenderer> Renderer = new(() => PdftoppmRenderer.Create("pdftoppm", DrawTimeout), LazyThreadSafetyMode.PublicationOnly);

    /// <param name="pageWidth">Page width in page units (the coordinates of the boxes).</param>
    /// <param name="tokenRegions">The matched region of each query token, in query order.</param>
    /// <param name="widthPixels">Width of the image; the height keeps the page's proportions.</param>
    /// <param name="backdrop">The page to draw under the regions; null or undrawable: the word boxes instead.</param>
    /// <returns>Null when the map is drawn over the page, else why it shows word boxes instead.</returns>
    public static string? WritePng(
        Stream destination, float pageWidth, float pageHeight, IReadOnlyList<PageBox> wordBoxes, IReadOnlyList<PageBox> tokenRegions, int widthPixels = 800, MapBackdrop? backdrop = null)
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

        var (page, fallback) = backdrop is null ? (null, "no page to draw") : Draw(backdrop, widthPixels * 72.0 / pageWidth);
        using (page)
        {
            if (page is not null)
            {
                using var sampling = new SKPaint { IsAntialias = true };
                canvas.DrawBitmap(page, new SKRect(0, 0, widthPixels, heightPixels), sampling);
            }
            else
            {
                fill.Color = WordFill;
                edge.Color = WordEdge;
                foreach (var box in wordBoxes)
                {
                    var rectangle = ToPixels(box, pageHeight, scale);
                    canvas.DrawRect(rectangle, fill);
                    canvas.DrawRect(rectangle, edge);
                }
            }
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
        return fallback;
    }

    /// <summary>The page in its unrotated orientation, or why it cannot be drawn.</summary>
    private static (SKBitmap? Page, string? Why) Draw(MapBackdrop backdrop, double dpi)
    {
        if (!MapBackdrop.Draws(backdrop.Kind))
        {
            return (null, $"pages of kind {backdrop.Kind} are not drawn");
        }

        try
        {
            if (backdrop.Kind != DocumentKind.Pdf)
            {
                var decoded = SKBitmap.Decode(backdrop.FilePath);
                return decoded is null ? (null, "the image cannot be decoded") : (decoded, null);
            }

            RasterImage? drawn = null;
            Renderer.Value.Render(
                backdrop.FilePath, backdrop.PageNumber, backdrop.PageNumber, (int)Math.Clamp(Math.Round(dpi), 18, 600), (_, raster) => drawn = raster, CancellationToken.None);
            return drawn is null ? (null, "pdftoppm drew nothing") : (ToBitmap(drawn.RotateClockwise((360 - backdrop.Rotation) % 360)), null);
        }
        catch (Exception e) when (e is InvalidOperationException or IOException or UnauthorizedAccessException or ArgumentException)
        {
            return (null, e.Message);
        }
    }

    private static SKBitmap ToBitmap(RasterImage raster)
    {
        var bitmap = new SKBitmap(new SKImageInfo(raster.Width, raster.Height, SKColorType.Rgba8888, SKAlphaType.Opaque));
        var pixels = new byte[raster.Width * raster.Height * 4];
        for (int i = 0, o = 0; i < raster.Pixels.Length; i += raster.Channels, o += 4)
        {
            pixels[o] = raster.Pixels[i];
            pixels[o + 1] = raster.Pixels[i + (raster.Channels == 3 ? 1 : 0)];
            pixels[o + 2] = raster.Pixels[i + (raster.Channels == 3 ? 2 : 0)];
            pixels[o + 3] = 255;
        }

        System.Runtime.InteropServices.Marshal.Copy(pixels, 0, bitmap.GetPixels(), pixels.Length);
        return bitmap;
    }

    /// <summary>Hues a golden angle apart, so neighbouring tokens never share a colour.</summary>
    internal static SKColor TokenColour(int token) => SKColor.FromHsv((float)(token * 137.508 % 360), 85, 85);

    // Page coordinates have their origin at the bottom left; pixels at the top left.
    private static SKRect ToPixels(PageBox box, float pageHeight, float scale) =>
        new(box.Left * scale, (pageHeight - box.Top) * scale, box.Right * scale, (pageHeight - box.Bottom) * scale);
}
