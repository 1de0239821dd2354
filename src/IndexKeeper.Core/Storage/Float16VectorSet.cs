using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding;

namespace IndexKeeper.Core.Storage;

/// <summary>
/// A page's vectors already in the stored element type (float16 rows, row-major, as
/// <see cref="VectorQuantization.ToFloat16(ReadOnlySpan{float})"/> makes them) with one region per row: what a
/// remote worker hands back, so the one writer appends without converting. Sign codes are not part of it:
/// the segment writer derives them from these rows, as it does for a local batch.
/// </summary>
public sealed class Float16VectorSet
{
    public Float16VectorSet(int dimensions, Half[] vectors, PageBox[] regions)
    {
        ArgumentNullException.ThrowIfNull(vectors);
        ArgumentNullException.ThrowIfNull(regions);
        VectorSet.CheckShape(dimensions, vectors.Length, regions.Length);
        Dimensions = dimensions;
        Vectors = vectors;
        Regions = regions;
    }

    public int Dimensions { get; }

    public int Count => Regions.Length;

    public Half[] Vectors { get; }

    public PageBox[] Regions { get; }
}
