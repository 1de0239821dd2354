namespace IndexKeeper.Core.Drift;

/// <summary>
/// Compares stored vectors (float16, as segments keep them) with freshly encoded ones, row by row: the pure
/// half of a canary check. The stored rows were L2-normalised before float16 rounding, so their cosine with
/// the same fresh row is 1 within about 1e-6; thresholds sit far below that.
/// </summary>
public sealed class CanaryComparison(CanarySettings settings)
{
    private double sum;
    private long vectors;
    private double minimum = 1.0;
    private int pages;
    private int mismatched;

    /// <summary>Adds one canary page: <paramref name="stored"/> and <paramref name="fresh"/> are row-major with <paramref name="dimensions"/> columns.</summary>
    public void Add(ReadOnlySpan<Half> stored, ReadOnlySpan<float> fresh, int dimensions)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(dimensions, 1);
        pages++;
        if (stored.Length != fresh.Length)
        {
            // Another vector count (or width) for the same page: the encoder no longer makes what it claims.
            mismatched++;
            minimum = 0;
            return;
        }

        for (var row = 0; row < stored.Length / dimensions; row++)
        {
            var cosine = Cosine(stored.Slice(row * dimensions, dimensions), fresh.Slice(row * dimensions, dimensions));
            sum += cosine;
            vectors++;
            minimum = Math.Min(minimum, cosine);
        }
    }

    public CanaryFigures Result()
    {
        var mean = vectors == 0 ? (mismatched > 0 ? 0 : 1) : sum / vectors;
        var drifted = mismatched > 0 || mean < settings.MinimumMeanCosine || minimum < settings.MinimumCosine;
        return new CanaryFigures(pages, vectors, mismatched, mean, minimum, drifted);
    }

    /// <summary>Cosine in double precision; a zero row against a zero row is 1 (nothing changed), against anything else 0.</summary>
    internal static double Cosine(ReadOnlySpan<Half> a, ReadOnlySpan<float> b)
    {
        double dot = 0, aa = 0, bb = 0;
        for (var i = 0; i < a.Length; i++)
        {
            var x = (double)a[i];
            var y = (double)b[i];
            dot += x * y;
            aa += x * x;
            bb += y * y;
        }

        if (aa == 0 || bb == 0)
        {
            return aa == bb ? 1 : 0;
        }

        return dot / Math.Sqrt(aa * bb);
    }
}
