namespace IndexKeeper.Core.Search;

/// <summary>
/// One bit per dimension, as <see cref="Storage.StoredVectors"/> lays it out: bit <c>i % 64</c> of word
/// <c>i / 64</c> is set when component <c>i</c> is ≥ 0. The share of differing bits between two codes
/// estimates the angle between the vectors over π (random-hyperplane hashing, Charikar, STOC 2002).
/// </summary>
internal static class SignCodes
{
    public static int WordsPerCode(int dimensions) => dimensions / 64;

    /// <summary>Writes the code of each row of <paramref name="rows"/> (row-major, <paramref name="dimensions"/> wide).</summary>
    public static void Compute(ReadOnlySpan<float> rows, int dimensions, Span<ulong> codes)
    {
        var words = WordsPerCode(dimensions);
        var count = rows.Length / dimensions;
        for (var r = 0; r < count; r++)
        {
            var row = rows.Slice(r * dimensions, dimensions);
            for (var w = 0; w < words; w++)
            {
                ulong word = 0;
                for (var bit = 0; bit < 64; bit++)
                {
                    if (row[(w * 64) + bit] >= 0)
                    {
                        word |= 1UL << bit;
                    }
                }

                codes[(r * words) + w] = word;
            }
        }
    }
}
