using IndexKeeper.Core.Documents;
using SixLabors.ImageSharp;
using SixLabors.ImageSharp.PixelFormats;
using SkiaSharp;

namespace IndexKeeper.Core.Encoding.PageImages;

/// <summary>
/// Decodes a page of a PNG, JPEG or TIFF file to RGB as stored (no orientation applied, no colour
/// management), with the same libraries the document reader keys pixels with; transparency is laid over
/// white paper.
/// </summary>
internal static class ImageFileDecoder
{
    /// <summary>Decodes the given pages (1-based) of one file, each handed over as soon as it is decoded; a multi-page TIFF is decoded once.</summary>
    /// <exception cref="InvalidOperationException">The file does not decode (it changed since it was read, or is damaged).</exception>
    public static void Decode(byte[] file, DocumentKind kind, IEnumerable<int> pageNumbers, Action<int, RasterImage> onPage, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(file);
        ArgumentNullException.ThrowIfNull(pageNumbers);
        ArgumentNullException.ThrowIfNull(onPage);
        switch (kind)
        {
            case DocumentKind.Png or DocumentKind.Jpeg:
                var image = DecodeWithSkia(file, kind);
                foreach (var number in pageNumbers)
                {
                    onPage(number == 1 ? number : throw new InvalidOperationException($"a {kind} file has one page, not page {number}"), image);
                }

                break;
            case DocumentKind.Tiff:
                DecodeTiff(file, pageNumbers, onPage, cancellationToken);
                break;
            default:
                throw new InvalidOperationException($"a {kind} file is not an image page");
        }
    }

    private static RasterImage DecodeWithSkia(byte[] file, DocumentKind kind)
    {
        using var data = SKData.CreateCopy(file);
        using var codec = SKCodec.Create(data) ?? throw new InvalidOperationException($"the {kind} file cannot be decoded");
        var info = new SKImageInfo(codec.Info.Width, codec.Info.Height, SKColorType.Rgba8888, SKAlphaType.Unpremul);
        var rgba = new byte[info.BytesSize];
        if (codec.GetPixels(info, rgba) != SKCodecResult.Success)
        {
            throw new InvalidOperationException($"the {kind} file does not decode completely");
        }

        return OverWhite(info.Width, info.Height, rgba);
    }

    private static void DecodeTiff(byte[] file, IEnumerable<int> pageNumbers, Action<int, RasterImage> onPage, CancellationToken cancellationToken)
    {
        Image<Rgba32> image;
        try
        {
            image = Image.Load<Rgba32>(file);
        }
        catch (Exception e) when (e is not (OutOfMemoryException or OperationCanceledException))
        {
            // Damaged files make decoders throw exceptions of many types; all of them mean the same.
            throw new InvalidOperationException($"the TIFF file cannot be decoded ({e.GetType().Name}: {e.Message})", e);
        }

        using (image)
        {
            foreach (var number in pageNumbers)
            {
                cancellationToken.ThrowIfCancellationRequested();
                if (number < 1 || number > image.Frames.Count)
                {
                    throw new InvalidOperationException($"the TIFF file has {image.Frames.Count} page(s), not page {number}");
                }

                var frame = image.Frames[number - 1];
                var rgba = new byte[frame.Width * frame.Height * 4];
                frame.CopyPixelDataTo(rgba);
                onPage(number, OverWhite(frame.Width, frame.Height, rgba));
            }
        }
    }

    // Straight (unpremultiplied) alpha composited over white: c·a + 255·(1 − a), rounded.
    private static RasterImage OverWhite(int width, int height, byte[] rgba)
    {
        var rgb = new byte[width * height * 3];
        for (int i = 0, o = 0; i < rgba.Length; i += 4, o += 3)
        {
            var alpha = rgba[i + 3];
            for (var c = 0; c < 3; c++)
            {
                rgb[o + c] = (byte)(((rgba[i + c] * alpha) + (255 * (255 - alpha)) + 127) / 255);
            }
        }

        return new RasterImage(width, height, 3, rgb);
    }
}
