using System.Buffers;
using System.Numerics.Tensors;

namespace IndexKeeper.Core.Encoding.PageImages;

/// <summary>
/// Turns a raster into the page graph's input (docs/encoders.md, "Pre-processing"): placed as
/// <see cref="PagePlacement"/> says, resampled by area averaging (each input pixel is the mean of the
/// source area it covers, partly covered source pixels weighted by the covered share, the part outside the
/// raster counted as white paper), then each channel scaled to 0..1 and normalised as (v − mean) / std,
/// laid out planar as [1, 3, height, width] (NCHW). Grey rasters feed all three channels. Pure, and the
/// arithmetic has a fixed order, so the same raster gives the same floats everywhere.
/// </summary>
internal sealed class PageImagePreprocessor
{
    private const float Paper = 255f;
    private readonly int width;
    private readonly int height;
    private readonly string fit;
    private readonly float[] scale = new float[3];
    private readonly float[] shift = new float[3];

    public PageImagePreprocessor(int width, int height, string fit, IReadOnlyList<double> mean, IReadOnlyList<double> std)
    {
        ArgumentNullException.ThrowIfNull(mean);
        ArgumentNullException.ThrowIfNull(std);
        this.width = width;
        this.height = height;
        this.fit = fit;
        for (var c = 0; c < 3; c++)
        {
            // (v / 255 − mean) / std as one multiply and one add.
            scale[c] = (float)(1.0 / (255.0 * std[c]));
            shift[c] = (float)(-mean[c] / std[c]);
        }
    }

    public PagePlacement Place(RasterImage raster)
    {
        ArgumentNullException.ThrowIfNull(raster);
        return PagePlacement.Of(raster.Width, raster.Height, width, height, fit);
    }

    /// <summary>Fills <paramref name="input"/> (3 × height × width floats) from the raster.</summary>
    public void Fill(RasterImage raster, PagePlacement placement, Span<float> input)
    {
        ArgumentNullException.ThrowIfNull(raster);
        if (input.Length != 3 * width * height)
        {
            throw new ArgumentException($"The input holds {input.Length} floats, not 3×{height}×{width}.", nameof(input));
        }

        var columns = Taps.Of(width, placement.SourceWidth, placement.ScaleX, placement.OffsetX);
        var rows = Taps.Of(height, placement.SourceHeight, placement.ScaleY, placement.OffsetY);
        var channels = raster.Channels;
        var sourceRow = raster.Width * channels;
        var samples = ArrayPool<float>.Shared.Rent(raster.Pixels.Length);
        var vertical = ArrayPool<float>.Shared.Rent(height * sourceRow);
        try
        {
            TensorPrimitives.ConvertChecked<byte, float>(raster.Pixels, samples.AsSpan(0, raster.Pixels.Length));

            // Vertical pass first (it shrinks the rows the scalar pass must visit): whole source rows weighted
            // and added, contiguous, so vectorised.
            for (var y = 0; y < height; y++)
            {
                var accumulated = vertical.AsSpan(y * sourceRow, sourceRow);
                accumulated.Fill(rows.Outside[y] * Paper);
                var weights = rows.Weights[y];
                for (var k = 0; k < weights.Length; k++)
                {
                    AddScaled(samples.AsSpan((rows.First[y] + k) * sourceRow, sourceRow), weights[k], accumulated);
                }
            }

            // Horizontal pass, normalised straight into the planar layout.
            var plane = width * height;
            for (var y = 0; y < height; y++)
            {
                var row = vertical.AsSpan(y * sourceRow, sourceRow);
                for (var x = 0; x < width; x++)
                {
                    var weights = columns.Weights[x];
                    var first = columns.First[x] * channels;
                    var pad = columns.Outside[x] * Paper;
                    var at = (y * width) + x;
                    if (channels == 3)
                    {
                        float red = pad, green = pad, blue = pad;
                        for (var k = 0; k < weights.Length; k++)
                        {
                            var sample = first + (3 * k);
                            red += weights[k] * row[sample];
                            green += weights[k] * row[sample + 1];
                            blue += weights[k] * row[sample + 2];
                        }

                        input[at] = (red * scale[0]) + shift[0];
                        input[plane + at] = (green * scale[1]) + shift[1];
                        input[(2 * plane) + at] = (blue * scale[2]) + shift[2];
                    }
                    else
                    {
                        var grey = pad;
                        for (var k = 0; k < weights.Length; k++)
                        {
                            grey += weights[k] * row[first + k];
                        }

                        for (var o = 0; o < 3; o++)
                        {
                            input[(o * plane) + at] = (grey * scale[o]) + shift[o];
                        }
                    }
                }
            }
        }
        finally
        {
            ArrayPool<float>.Shared.Return(samples);
            ArrayPool<float>.Shared.Return(vertical);
        }
    }

    // accumulated += source × weight, element by element, a multiply then an add (never fused, so every
    // platform and vector width gives the same floats).
    private static void AddScaled(ReadOnlySpan<float> source, float weight, Span<float> accumulated)
    {
        var i = 0;
        if (System.Numerics.Vector.IsHardwareAccelerated)
        {
            var factor = new System.Numerics.Vector<float>(weight);
            var lanes = System.Numerics.Vector<float>.Count;
            for (; i + lanes <= source.Length; i += lanes)
            {
                var product = new System.Numerics.Vector<float>(source[i..]) * factor;
                (new System.Numerics.Vector<float>(accumulated[i..]) + product).CopyTo(accumulated[i..]);
            }
        }

        for (; i < source.Length; i++)
        {
            accumulated[i] += source[i] * weight;
        }
    }

    /// <summary>For each output pixel of one axis: the first source pixel it covers, the covered shares, and the share outside the raster.</summary>
    private sealed record Taps(int[] First, float[][] Weights, float[] Outside)
    {
        /// <summary>Output pixel o spans source [(o − offset) / scale, (o + 1 − offset) / scale).</summary>
        public static Taps Of(int outputSize, int sourceSize, double scale, double offset)
        {
            var first = new int[outputSize];
            var weights = new float[outputSize][];
            var outside = new float[outputSize];
            var length = 1 / scale;
            for (var o = 0; o < outputSize; o++)
            {
                var from = Math.Max(0, (o - offset) / scale);
                var to = Math.Min(sourceSize, (o + 1 - offset) / scale);
                if (to <= from)
                {
                    weights[o] = [];
                    outside[o] = 1f;
                    continue;
                }

                var start = (int)Math.Floor(from);
                var end = Math.Min(sourceSize, (int)Math.Ceiling(to));
                var w = new float[end - start];
                double inside = 0;
                for (var s = start; s < end; s++)
                {
                    var overlap = Math.Min(to, s + 1) - Math.Max(from, s);
                    w[s - start] = (float)(overlap / length);
                    inside += overlap;
                }

                first[o] = start;
                weights[o] = w;
                outside[o] = (float)Math.Max(0, 1 - (inside / length));
            }

            return new Taps(first, weights, outside);
        }
    }
}
