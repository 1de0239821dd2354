using IndexKeeper.Core.Drift;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Tests.Drift;

/// <summary>The pure half of a canary check: cosines of stored float16 rows against fresh rows, and the verdict.</summary>
public sealed class CanaryComparisonTests
{
    private static readonly CanarySettings Settings = new(16, 0.999, 0.99);

    [Fact]
    public void The_same_vectors_stored_as_float16_are_no_drift()
    {
        var fresh = UnitRows(seed: 1, rows: 40, dimensions: 128);
        var comparison = new CanaryComparison(Settings);
        comparison.Add(VectorQuantization.ToFloat16(fresh), fresh, 128);
        var figures = comparison.Result();

        // IEEE 754 binary16 keeps 11 significant bits (relative error ≤ 2^-11 per component), so a unit
        // row's cosine with its rounded copy is 1 - O(2^-22): far above any threshold.
        Assert.False(figures.Drifted);
        Assert.Equal(40, figures.Vectors);
        Assert.True(figures.MinimumCosine > 0.99999, $"minimum {figures.MinimumCosine}");
        Assert.True(figures.MeanCosine > 0.99999, $"mean {figures.MeanCosine}");
    }

    [Fact]
    public void Noise_below_the_thresholds_is_drift_with_its_figures()
    {
        var stored = UnitRows(seed: 2, rows: 30, dimensions: 64);
        var fresh = (float[])stored.Clone();
        var random = new Random(3);
        for (var i = 0; i < 64; i++)
        {
            fresh[i] += (float)(random.NextDouble() - 0.5); // only the first row changes, a lot
        }

        var comparison = new CanaryComparison(Settings);
        comparison.Add(VectorQuantization.ToFloat16(stored), fresh, 64);
        var figures = comparison.Result();
        Assert.True(figures.Drifted);
        Assert.True(figures.MinimumCosine < 0.99);
        Assert.Equal(figures.MinimumCosine, CanaryComparison.Cosine(VectorQuantization.ToFloat16(stored.AsSpan(0, 64)), fresh.AsSpan(0, 64)), 12);
        Assert.True(figures.MeanCosine > figures.MinimumCosine);
    }

    [Fact]
    public void The_mean_threshold_catches_small_drift_on_every_vector()
    {
        var stored = UnitRows(seed: 4, rows: 20, dimensions: 64);
        var fresh = stored.Select((v, i) => v + (i % 64 == 0 ? 0.05f : 0f)).ToArray();
        var comparison = new CanaryComparison(new CanarySettings(16, 0.9999999, 0.5));
        comparison.Add(VectorQuantization.ToFloat16(stored), fresh, 64);
        var figures = comparison.Result();
        Assert.True(figures.Drifted);
        Assert.True(figures.MinimumCosine >= 0.5);
    }

    [Fact]
    public void Another_vector_count_for_the_same_page_is_drift()
    {
        var stored = UnitRows(seed: 5, rows: 3, dimensions: 64);
        var comparison = new CanaryComparison(Settings);
        comparison.Add(VectorQuantization.ToFloat16(stored), stored.AsSpan(0, 128), 64);
        var figures = comparison.Result();
        Assert.True(figures.Drifted);
        Assert.Equal(1, figures.MismatchedPages);
        Assert.Equal(0, figures.MinimumCosine);
    }

    [Fact]
    public void No_canaries_is_no_drift()
    {
        var figures = new CanaryComparison(Settings).Result();
        Assert.False(figures.Drifted);
        Assert.Equal(0, figures.Pages);
    }

    [Fact]
    public void Canaries_are_the_lowest_page_keys_whatever_the_order()
    {
        string[] keys = ["f0", "0a", "9c", "0a", "3b"];
        Assert.Equal(["0a", "3b", "9c"], CanarySelection.Choose(keys, 3));
        Assert.Equal(CanarySelection.Choose(keys.Reverse(), 3), CanarySelection.Choose(keys, 3));
        Assert.Empty(CanarySelection.Choose(keys, 0));
    }

    private static float[] UnitRows(int seed, int rows, int dimensions)
    {
        var random = new Random(seed);
        var values = new float[rows * dimensions];
        for (var r = 0; r < rows; r++)
        {
            double norm = 0;
            for (var i = 0; i < dimensions; i++)
            {
                var v = (float)((random.NextDouble() * 2) - 1);
                values[(r * dimensions) + i] = v;
                norm += v * v;
            }

            for (var i = 0; i < dimensions; i++)
            {
                values[(r * dimensions) + i] /= (float)Math.Sqrt(norm);
            }
        }

        return values;
    }
}
