using IndexKeeper.Core.Search;
using IndexKeeper.Tests.Encoding;

namespace IndexKeeper.Tests.Search;

public sealed class SignCodeTests
{
    [Fact]
    public void Bits_follow_the_stored_layout_and_negative_zero_counts_as_non_negative()
    {
        var vector = Enumerable.Repeat(0.5f, 128).ToArray();
        vector[0] = -1;
        vector[3] = -0.25f;
        vector[64] = -2;
        vector[127] = -1e-30f;
        vector[5] = -0f; // IEEE 754: -0 compares equal to +0, so it is "≥ 0".
        var codes = new ulong[2];
        SignCodes.Compute(vector, 128, codes);
        Assert.Equal(~((1UL << 0) | (1UL << 3)), codes[0]);
        Assert.Equal(~((1UL << 0) | (1UL << 63)), codes[1]);
    }

    [Theory]
    [InlineData(Math.PI / 6)]
    [InlineData(Math.PI / 3)]
    [InlineData(Math.PI / 2)]
    [InlineData(2 * Math.PI / 3)]
    [InlineData(5 * Math.PI / 6)]
    public void Differing_bits_estimate_the_angle_over_pi(double angle)
    {
        // Charikar, STOC 2002 (random-hyperplane hashing): for a uniformly random rotation the chance that one
        // sign differs is θ/π. Each bit of a Gaussian-rotated pair is such a hyperplane; over 400 pairs of
        // d = 128 the mean fraction has standard deviation ≤ sqrt(0.25 / 51,200) ≈ 0.0022; the tolerance 0.01 is 4.5σ.
        const int dimensions = 128;
        const int pairs = 400;
        var random = new Random(20020519);
        var total = 0.0;
        var codeA = new ulong[2];
        var codeB = new ulong[2];
        for (var i = 0; i < pairs; i++)
        {
            var a = VectorPoolingTests.Unit(VectorPoolingTests.Gaussian(random, dimensions));
            var u = VectorPoolingTests.Gaussian(random, dimensions);
            var along = u.Zip(a).Sum(p => (double)p.First * p.Second);
            var orthogonal = VectorPoolingTests.Unit(u.Zip(a, (x, y) => (float)(x - (along * y))).ToArray());
            var b = a.Zip(orthogonal, (x, y) => (float)((Math.Cos(angle) * x) + (Math.Sin(angle) * y))).ToArray();
            SignCodes.Compute(a, dimensions, codeA);
            SignCodes.Compute(b, dimensions, codeB);
            total += (double)(ulong.PopCount(codeA[0] ^ codeB[0]) + ulong.PopCount(codeA[1] ^ codeB[1])) / dimensions;
        }

        Assert.InRange(total / pairs, (angle / Math.PI) - 0.01, (angle / Math.PI) + 0.01);
    }
}
