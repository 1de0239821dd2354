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
}
