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
        CheckShape(dimensions, vectors.Length, regions.Length);
        Dimensions = dimensions;
        Vectors = vectors;
        Regions = regions;
    }

    public int Dimensions { get; }

    public int Count => Regions.Length;

    public float[] Vectors { get; }

    public PageBox[] Regions { get; }

    public ReadOnlySpan<float> Row(int index) => Vectors.AsSpan(index * Dimensions, Dimensions);

    /// <summary>Throws unless <paramref name="values"/> form whole rows of <paramref name="dimensions"/>, one per region (any element type).</summary>
    internal static void CheckShape(int dimensions, int values, int regions)
    {
        if (dimensions <= 0 || values % dimensions != 0)
        {
            throw new ArgumentException($"{values} values do not form rows of {dimensions}.", "vectors");
        }

        if (regions != values / dimensions)
        {
            throw new ArgumentException($"{regions} regions for {values / dimensions} vectors.", "regions");
        }
    }
}
