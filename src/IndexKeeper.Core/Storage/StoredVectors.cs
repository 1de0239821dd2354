using IndexKeeper.Core.Documents;

namespace IndexKeeper.Core.Storage;

/// <summary>
/// A stored vector set as search sees it, without copying: <see cref="Count"/> float16 rows of
/// <see cref="Dimensions"/>, and per row a sign code of <c>Dimensions / 64</c> words (bit <c>i % 64</c> of
/// word <c>i / 64</c> is set when component <c>i</c> is ≥ 0). Spans point into a mapped segment.
/// </summary>
public readonly ref struct StoredVectors
{
    public StoredVectors(PageKey key, int dimensions, ReadOnlySpan<Half> vectors, ReadOnlySpan<ulong> signCodes, ReadOnlySpan<PageBox> regions)
    {
        Key = key;
        Dimensions = dimensions;
        Vectors = vectors;
        SignCodes = signCodes;
        Regions = regions;
    }

    public PageKey Key { get; }

    public int Dimensions { get; }

    public int Count => Dimensions == 0 ? 0 : Vectors.Length / Dimensions;

    public int WordsPerCode => Dimensions / 64;

    public ReadOnlySpan<Half> Vectors { get; }

    public ReadOnlySpan<ulong> SignCodes { get; }

    public ReadOnlySpan<PageBox> Regions { get; }
}
