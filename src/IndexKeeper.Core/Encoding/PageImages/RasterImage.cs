namespace IndexKeeper.Core.Encoding.PageImages;

/// <summary>
/// 8-bit pixels of a page as displayed: <see cref="Channels"/> samples a pixel (1 grey, 3 R G B),
/// rows top to bottom, pixels left to right, no padding.
/// </summary>
internal sealed class RasterImage
{
    public RasterImage(int width, int height, int channels, byte[] pixels)
    {
        ArgumentNullException.ThrowIfNull(pixels);
        ArgumentOutOfRangeException.ThrowIfLessThan(width, 1);
        ArgumentOutOfRangeException.ThrowIfLessThan(height, 1);
        if (channels is not (1 or 3))
        {
            throw new ArgumentOutOfRangeException(nameof(channels), channels, "A raster has 1 (grey) or 3 (RGB) channels.");
        }

        if (pixels.LongLength != (long)width * height * channels)
        {
            throw new ArgumentException($"{pixels.LongLength} bytes are not {width}×{height}×{channels}.", nameof(pixels));
        }

        Width = width;
        Height = height;
        Channels = channels;
        Pixels = pixels;
    }

    public int Width { get; }

    public int Height { get; }

    public int Channels { get; }

    public byte[] Pixels { get; }

    /// <summary>The image turned clockwise by 0, 90, 180 or 270 degrees (how a viewer shows a page with that rotation).</summary>
    public RasterImage RotateClockwise(int degrees)
    {
        if (degrees == 0)
        {
            return this;
        }

        if (degrees is not (90 or 180 or 270))
        {
            throw new ArgumentOutOfRangeException(nameof(degrees), degrees, "Rotation is 0, 90, 180 or 270 degrees.");
        }

        var (width, height) = degrees == 180 ? (Width, Height) : (Height, Width);
        var result = new byte[Pixels.Length];
        for (var y = 0; y < Height; y++)
        {
            for (var x = 0; x < Width; x++)
            {
                // Where source pixel (x, y) lands, counted from the top left of the turned image.
                var (tx, ty) = degrees switch
                {
                    90 => (Height - 1 - y, x),
                    180 => (Width - 1 - x, Height - 1 - y),
                    _ => (y, Width - 1 - x),
                };
                Array.Copy(Pixels, ((y * Width) + x) * Channels, result, ((ty * width) + tx) * Channels, Channels);
            }
        }

        return new RasterImage(width, height, Channels, result);
    }
}
