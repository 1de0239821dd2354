using IndexKeeper.Core.Search;
using IndexKeeper.Tests.Encoding;

namespace IndexKeeper.Tests.Search;

public sealed class MaxSimKernelTests
{
    [Theory]
    [InlineData(128, 150, 20)]
    [InlineData(128, 64, 7)]
    [InlineData(64, 1, 1)]
    [InlineData(192, 131, 5)]
    public void Exact_maxsim_matches_the_scalar_reference(int dimensions, int rows, int tokens)
    {
        // Reference: the definition of late interaction (Khattab & Zaharia, ColBERT, SIGIR 2020), in ReferenceMaxSim.
        var page = ReferenceMaxSim.ThroughHalf(VectorPoolingTests.RandomSet(rows, dimensions, seed: rows).Vectors);
        var query = VectorPoolingTests.RandomSet(tokens, dimensions, seed: tokens + 1000).Vectors;
        var halves = page.Select(x => (Half)x).ToArray();
        var block = new float[MaxSimKernels.BlockRows * dimensions];
        var best = new float[tokens];
        var index = new int[tokens];

        var score = MaxSimKernels.Exact(query, halves, dimensions, block, best, index);

        var expected = ReferenceMaxSim.Matches(query, page, dimensions);
        Assert.Equal(expected.Sum(m => m.Similarity), score, 1e-4);
        for (var q = 0; q < tokens; q++)
        {
            Assert.Equal(expected[q].Similarity, best[q], 1e-5);
            Assert.Equal(expected[q].Index, index[q]);
        }
    }

    [Theory]
    [InlineData(128, 150, 20)]
    [InlineData(64, 33, 3)]
    [InlineData(256, 70, 9)]
    public void Hamming_maxsim_matches_the_sign_by_sign_reference(int dimensions, int rows, int tokens)
    {
        var page = VectorPoolingTests.RandomSet(rows, dimensions, seed: rows + 7).Vectors;
        var query = VectorPoolingTests.RandomSet(tokens, dimensions, seed: tokens + 70).Vectors;
        var words = dimensions / 64;
        var pageCodes = new ulong[rows * words];
        var queryCodes = new ulong[tokens * words];
        SignCodes.Compute(page, dimensions, pageCodes);
        SignCodes.Compute(query, dimensions, queryCodes);

        Assert.Equal(ReferenceMaxSim.Hamming(query, page, dimensions), MaxSimKernels.Hamming(queryCodes, pageCodes, dimensions, new int[tokens]));
    }

    [Theory]
    [InlineData(128, 150, 20, false)]
    [InlineData(128, 40, 3, true)]
    [InlineData(128, 90, 1, true)]
    [InlineData(128, 60, 6, false)]
    [InlineData(64, 33, 3, false)]
    [InlineData(256, 70, 9, true)]
    public void Pruned_hamming_maxsim_keeps_every_page_that_reaches_the_floor_and_drops_the_others(int dimensions, int rows, int tokens, bool holdsQueryRows)
    {
        // Reference: Hamming MaxSim sign by sign (ReferenceMaxSim.Hamming); a page holding the query's own rows
        // makes some tokens stop at distance 0.
        var page = VectorPoolingTests.RandomSet(rows, dimensions, seed: rows + 11).Vectors;
        var query = VectorPoolingTests.RandomSet(tokens, dimensions, seed: tokens + 110).Vectors;
        if (holdsQueryRows)
        {
            page = [.. page, .. query.AsSpan(0, Math.Min(2, tokens) * dimensions).ToArray()];
        }

        var words = dimensions / 64;
        var pageCodes = new ulong[page.Length / dimensions * words];
        var queryCodes = new ulong[tokens * words];
        SignCodes.Compute(page, dimensions, pageCodes);
        SignCodes.Compute(query, dimensions, queryCodes);
        var expected = ReferenceMaxSim.Hamming(query, page, dimensions);
        var backwards = Enumerable.Range(0, tokens).Reverse().ToArray();

        // Any token order gives the same sum; a page at the floor is kept (it may still enter on a lower ordinal).
        Assert.Equal(expected, MaxSimKernels.HammingAbove(queryCodes, backwards, pageCodes, dimensions, new int[tokens], float.NegativeInfinity));
        Assert.Equal(expected, MaxSimKernels.HammingAbove(queryCodes, backwards, pageCodes, dimensions, new int[tokens], expected));
        Assert.Equal(int.MinValue, MaxSimKernels.HammingAbove(queryCodes, backwards, pageCodes, dimensions, new int[tokens], expected + 1));
    }
}
