using IndexKeeper.Core.Documents;

namespace IndexKeeper.Core.Encoding;

/// <summary>
/// The vectors an encoder made for one page (or one query): <see cref="Count"/> rows of
/// <see cref="Dimensions"/> floats, row-major, each row L2-normalised, each with the page region it describes.
/// </summary>
public sealed class VectorSet
{
    public VectorSet(int dimensions, float[] vectors, PageBox[] regions)
    {
        ArgumentNullException.ThrowIfNull(vectors);
        ArgumentNullException.ThrowIfNull(regions);
        if (dimensions <= 0 || vectors.Length % dimensions != 0)
        {
            throw new ArgumentException($"{vectors.Length} floats do not form rows of {dimensions}.", nameof(vectors));
        }

        if (regions.Length != vectors.Length / dimensions)
        {
            throw new ArgumentException($"{regions.Length} regions for {vectors.Length / dimensions} vectors.", nameof(regions));
        }

        Dimensions = dimensions;
        Vectors = vectors;
        Regions = regions;
    }

    public int Dimensions { get; }

    public int Count => Regions.Length;

    public float[] Vectors { get; }

    public PageBox[] Regions { get; }

    public ReadOnlySpan<float> Row(int index) => Vectors.AsSpan(index * Dimensions, Dimensions);
}
