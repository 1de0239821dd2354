using System.Numerics.Tensors;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Core.Search;

/// <summary>
/// The sample queries of the recall figure (docs/search.md, "Recall"): pages drawn from the live directory by a
/// generator seeded with the view's generation, and from each page <see cref="Tokens"/> of its stored vectors
/// at an even stride as the query's tokens — a query in the encoder's own space that needs neither words nor
/// the encoder, and whose best pages are the drawn page and those sharing its content.
/// </summary>
public static class RecallSample
{
    /// <summary>Sample queries each time the figure is measured.</summary>
    public const int Queries = 16;

    /// <summary>Tokens of a sample query: a short query, as the benchmarks' 3-word queries (common practice).</summary>
    public const int Tokens = 4;

    /// <summary>
    /// Distinct positions in a directory of <paramref name="count"/> pages, at most <paramref name="queries"/>,
    /// drawn by SplitMix64 (Steele, Lea and Flood, OOPSLA 2014) from <paramref name="seed"/>.
    /// </summary>
    public static IReadOnlyList<int> Positions(int count, int queries, long seed)
    {
        var chosen = new SortedSet<int>();
        var state = unchecked((ulong)seed);
        for (var attempt = 0; chosen.Count < Math.Min(count, queries) && attempt < queries * 20; attempt++)
        {
            state = unchecked(state + 0x9E37_79B9_7F4A_7C15);
            var z = state;
            z = unchecked((z ^ (z >> 30)) * 0xBF58_476D_1CE4_E5B9);
            z = unchecked((z ^ (z >> 27)) * 0x94D0_49BB_1331_11EB);
            z ^= z >> 31;
            chosen.Add((int)(z % (ulong)count));
        }

        return [.. chosen];
    }

    /// <summary>The query made of <paramref name="page"/>: up to <see cref="Tokens"/> of its vectors at an even stride.</summary>
    public static VectorSet Query(StoredVectors page)
    {
        var dimensions = page.Dimensions;
        var tokens = Math.Min(Tokens, page.Count);
        var vectors = new float[tokens * dimensions];
        for (var t = 0; t < tokens; t++)
        {
            var row = t * page.Count / tokens;
            TensorPrimitives.ConvertToSingle(page.Vectors.Slice(row * dimensions, dimensions), vectors.AsSpan(t * dimensions, dimensions));
        }

        return new VectorSet(dimensions, vectors, [.. Enumerable.Repeat(new PageBox(0, 0, 0, 0), tokens)]);
    }
}
