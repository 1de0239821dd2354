using System.Runtime.InteropServices;
using SkiaSharp;

namespace IndexKeeper.Demo;

/// <summary>
/// A raster painted with integer arithmetic only, then encoded through SkiaSharp. Painting here rather
/// than on a Skia canvas keeps the pixels the same on every processor: Skia's anti-aliasing and
/// gradients take different code paths (and round differently) per instruction set.
/// </summary>
internal sealed class PixelCanvas
{
    private readonly byte[] pixels;

    public PixelCanvas(int width, int height, bool colour)
    {
        Width = width;
        Height = height;
        Channels = colour ? 3 : 1;
        pixels = new byte[width * height * Channels];
    }

    public int Width { get; }

    public int Height { get; }

    public int Channels { get; }

    /// <summary>The samples, row by row, <see cref="Channels"/> bytes per pixel.</summary>
    public Span<byte> Pixels => pixels;

    public void Set(int x, int y, DemoColour colour)
    {
        if ((uint)x >= (uint)Width || (uint)y >= (uint)Height)
        {
            return;
        }

        int at = (y * Width + x) * Channels;
        if (Channels == 1)
        {
            pixels[at] = colour.Grey;
        }
        else
        {
            pixels[at] = colour.Red;
            pixels[at + 1] = colour.Green;
            pixels[at + 2] = colour.Blue;
        }
    }

    public void FillRectangle(int x, int y, int width, int height, DemoColour colour)
    {
        for (int row = Math.Max(0, y); row < Math.Min(Height, y + height); row++)
        {
            for (int column = Math.Max(0, x); column < Math.Min(Width, x + width); column++)
            {
                Set(column, row, colour);
            }
        }
    }

    /// <summary>Axis-aligned ellipse by the exact integer test (dx·ry)² + (dy·rx)² ≤ (rx·ry)².</summary>
    public void FillEllipse(int centreX, int centreY, int radiusX, int radiusY, DemoColour colour)
    {
        long limit = (long)radiusX * radiusX * radiusY * radiusY;
        for (int dy = -radiusY; dy <= radiusY; dy++)
        {
            for (int dx = -radiusX; dx <= radiusX; dx++)
            {
                long a = (long)dx * radiusY;
                long b = (long)dy * radiusX;
                if (a * a + b * b <= limit)
                {
                    Set(centreX + dx, centreY + dy, colour);
                }
            }
        }
    }

    /// <summary>Rows <paramref name="top"/> to <paramref name="bottom"/> shaded linearly between two colours.</summary>
    public void VerticalGradient(int top, int bottom, DemoColour from, DemoColour to)
    {
        int span = Math.Max(1, bottom - top);
        for (int row = top; row < bottom; row++)
        {
            var colour = DemoColour.Mix(from, to, row - top, span);
            FillRectangle(0, row, Width, 1, colour);
        }
    }

    /// <summary>PNG with the Sub filter at zlib level 3: level 6 takes seconds on the grain of a scanned
    /// page for a tenth smaller file.</summary>
    public byte[] EncodePng() => Encode(pixmap => pixmap.Encode(new SKPngEncoderOptions(SKPngEncoderFilterFlags.Sub, 3)));

    public byte[] EncodeJpeg(int quality) => Encode(pixmap => pixmap.Encode(
        new SKJpegEncoderOptions(quality, SKJpegEncoderDownsample.Downsample420, SKJpegEncoderAlphaOption.Ignore)));

    private byte[] Encode(Func<SKPixmap, SKData?> encode)
    {
        SKImageInfo info;
        byte[] samples;
        if (Channels == 1)
        {
            info = new SKImageInfo(Width, Height, SKColorType.Gray8, SKAlphaType.Opaque);
            samples = pixels;
        }
        else
        {
            info = new SKImageInfo(Width, Height, SKColorType.Rgba8888, SKAlphaType.Opaque);
            samples = new byte[Width * Height * 4];
            for (int source = 0, target = 0; source < pixels.Length; source += 3, target += 4)
            {
                samples[target] = pixels[source];
                samples[target + 1] = pixels[source + 1];
                samples[target + 2] = pixels[source + 2];
                samples[target + 3] = 255;
            }
        }

        var handle = GCHandle.Alloc(samples, GCHandleType.Pinned);
        try
        {
            using var pixmap = new SKPixmap(info, handle.AddrOfPinnedObject(), info.RowBytes);
            using var data = encode(pixmap) ?? throw new InvalidOperationException("the image encoder refused the demo image");
            return data.ToArray();
        }
        finally
        {
            handle.Free();
        }
    }
}
