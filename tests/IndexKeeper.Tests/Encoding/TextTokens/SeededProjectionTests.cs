using IndexKeeper.Core.Encoding.TextTokens;

namespace IndexKeeper.Tests.Encoding.TextTokens;

public sealed class SeededProjectionTests
{
    [Fact]
    public void SplitMix64_matches_the_published_sequence()
    {
        // Rosetta Code task "Pseudo-random numbers/Splitmix64": the first five outputs for seed 1234567 (from memory).
        var state = 1234567UL;
        ulong[] expected = [6457827717110365317, 3203168211198807973, 9817491932198370423, 4593380528125082431, 16408922859458223821];
        Assert.Equal(expected, expected.Select(_ => SplitMix64.Next(ref state)).ToArray());
    }

    [Theory]
    [InlineData(64)]
    [InlineData(128)]
    [InlineData(384)]
    public void Rows_are_orthonormal(int d)
    {
        var projection = SeededProjection.Create(d, 384, 1);
        for (var i = 0; i < d; i++)
        {
            for (var j = i; j < d; j++)
            {
                var dot = 0.0;
                for (var c = 0; c < 384; c++)
                {
                    dot += projection.Row(i)[c] * (double)projection.Row(j)[c];
                }

                Assert.Equal(i == j ? 1.0 : 0.0, dot, 1e-5);
            }
        }
    }

    [Fact]
    public void The_same_seed_gives_the_same_matrix_and_another_seed_another()
    {
        var a = SeededProjection.Create(128, 384, 1);
        var b = SeededProjection.Create(128, 384, 1);
        var c = SeededProjection.Create(128, 384, 2);
        Assert.True(a.Row(5).SequenceEqual(b.Row(5)));
        Assert.False(a.Row(5).SequenceEqual(c.Row(5)));
    }

    [Fact]
    public void The_first_row_is_the_normalised_seeded_signs()
    {
        // Row 0 has nothing to be made orthogonal to: its entries are ±1/√384, signed by the generator's top bits.
        var projection = SeededProjection.Create(64, 384, 7);
        var state = 7UL;
        for (var c = 0; c < 384; c++)
        {
            var sign = (SplitMix64.Next(ref state) >> 63) == 0 ? 1.0 : -1.0;
            Assert.Equal((float)(sign / Math.Sqrt(384)), projection.Row(0)[c]);
        }
    }

    [Fact]
    public void Projected_vectors_have_unit_length()
    {
        var projection = SeededProjection.Create(128, 384, 1);
        var state = new float[384];
        for (var i = 0; i < state.Length; i++)
        {
            state[i] = MathF.Sin(i * 0.37f) * 3f;
        }

        var output = new float[128];
        projection.ProjectNormalised(state, output);
        Assert.Equal(1.0, Math.Sqrt(output.Sum(x => (double)x * x)), 1e-5);
    }
}
