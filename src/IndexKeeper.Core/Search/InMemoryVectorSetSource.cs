using System.Numerics.Tensors;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Core.Search;

/// <summary>
/// Vector sets held in memory in the stored form (float16 rows, sign codes), for tests and benchmarks of
/// search without segments.
/// </summary>
internal sealed class InMemoryVectorSetSource : IVectorSetSource
{
    private readonly List<(PageKey Key, int Dimensions, Half[] Vectors, ulong[] Codes, PageBox[] Regions)> pages = [];

    public int Count => pages.Count;

    public void Add(PageKey key, VectorSet set)
    {
        ArgumentNullException.ThrowIfNull(set);
        var vectors = new Half[set.Vectors.Length];
        TensorPrimitives.ConvertToHalf(set.Vectors, vectors);
        var codes = new ulong[set.Count * SignCodes.WordsPerCode(set.Dimensions)];
        SignCodes.Compute(set.Vectors, set.Dimensions, codes);
        pages.Add((key, set.Dimensions, vectors, codes, set.Regions.ToArray()));
    }

    public StoredVectors Get(int ordinal)
    {
        var page = pages[ordinal];
        return new StoredVectors(page.Key, page.Dimensions, page.Vectors, page.Codes, page.Regions);
    }
}
