using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding;

namespace IndexKeeper.Tests.Encoding;

public sealed class VectorPoolingTests
{
    [Theory]
    [InlineData(1030, 2, 515)]
    [InlineData(1030, 3, 344)]
    [InlineData(7, 4, 2)]
    [InlineData(3, 4, 1)]
    [InlineData(1, 2, 1)]
    [InlineData(0, 2, 0)]
    public void Pooling_leaves_the_count_divided_by_the_factor_rounded_up(int count, int factor, int expected) =>
        Assert.Equal(expected, VectorPooling.Pool(RandomSet(count, 64, seed: count), factor).Count);

    [Fact]
    public void Pooling_is_deterministic_and_keeps_unit_length()
    {
        var first = VectorPooling.Pool(RandomSet(300, 128, seed: 5), 3);
        var second = VectorPooling.Pool(RandomSet(300, 128, seed: 5), 3);
        Assert.Equal(first.Vectors, second.Vectors);
        Assert.Equal(first.Regions, second.Regions);
        for (var i = 0; i < first.Count; i++)
        {
            var norm = Math.Sqrt(first.Row(i).ToArray().Sum(x => (double)x * x));
            Assert.InRange(norm, 1 - 1e-5, 1 + 1e-5);
        }
    }

    [Fact]
    public void Pooling_recovers_planted_clusters_with_the_union_of_their_boxes()
    {
        // Three directions, four slightly perturbed copies of each, interleaved; factor 4 must give back the three.
        var random = new Random(11);
        var centres = Enumerable.Range(0, 3).Select(_ => Unit(Gaussian(random, 64))).ToArray();
        var vectors = new List<float>();
        var regions = new List<PageBox>();
        for (var i = 0; i < 12; i++)
        {
            var c = i % 3;
            vectors.AddRange(Unit(centres[c].Select(x => x + (0.02f * (float)Normal(random))).ToArray()));
            regions.Add(new PageBox(10 * i, 100 * c, (10 * i) + 5, (100 * c) + 8));
        }

        var pooled = VectorPooling.Pool(new Core.Encoding.VectorSet(64, [.. vectors], [.. regions]), 4);

        Assert.Equal(3, pooled.Count);
        for (var c = 0; c < 3; c++)
        {
            // Clusters are ordered by their first member, so cluster c holds vectors c, c+3, c+6, c+9.
            var dot = pooled.Row(c).ToArray().Zip(centres[c]).Sum(p => (double)p.First * p.Second);
            Assert.True(dot > 0.99, $"cluster {c}: cosine {dot} to its centre");
            Assert.Equal(new PageBox(10 * c, 100 * c, (10 * (c + 9)) + 5, (100 * c) + 8), pooled.Regions[c]);
        }
    }

    internal static Core.Encoding.VectorSet RandomSet(int count, int dimensions, int seed)
    {
        var random = new Random(seed);
        var vectors = Enumerable.Range(0, count).SelectMany(_ => Unit(Gaussian(random, dimensions))).ToArray();
        var regions = Enumerable.Range(0, count).Select(i => new PageBox(i, i, i + 1, i + 1)).ToArray();
        return new Core.Encoding.VectorSet(dimensions, vectors, regions);
    }

    internal static float[] Gaussian(Random random, int dimensions) =>
        Enumerable.Range(0, dimensions).Select(_ => (float)Normal(random)).ToArray();

    internal static float[] Unit(float[] vector)
    {
        var norm = Math.Sqrt(vector.Sum(x => (double)x * x));
        return vector.Select(x => (float)(x / norm)).ToArray();
    }

    // Box–Muller transform (common practice).
    internal static double Normal(Random random) =>
        Math.Sqrt(-2 * Math.Log(1 - random.NextDouble())) * Math.Cos(2 * Math.PI * random.NextDouble());
}
