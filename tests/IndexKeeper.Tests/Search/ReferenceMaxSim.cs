using System.Numerics.Tensors;

namespace IndexKeeper.Tests.Search;

/// <summary>
/// The definition of late interaction written out plainly, as an independent reference (Khattab &amp;
/// Zaharia, ColBERT, SIGIR 2020): score(q, p) = Σ over query vectors of the max over page vectors of the
/// dot product. Scalar, in double, no shared code with the engine.
/// </summary>
internal static class ReferenceMaxSim
{
    public static double Score(float[] query, float[] page, int dimensions) => Matches(query, page, dimensions).Sum(m => m.Similarity);

    /// <summary>The same definition in float32 on the registry's tensor library, fast enough for whole generated corpora.</summary>
    public static float FastScore(float[] query, float[] page, int dimensions)
    {
        var score = 0f;
        for (var q = 0; q < query.Length / dimensions; q++)
        {
            var best = float.NegativeInfinity;
            for (var p = 0; p < page.Length / dimensions; p++)
            {
                best = Math.Max(best, TensorPrimitives.Dot(query.AsSpan(q * dimensions, dimensions), page.AsSpan(p * dimensions, dimensions)));
            }

            score += best;
        }

        return score;
    }

    public static (int Index, double Similarity)[] Matches(float[] query, float[] page, int dimensions)
    {
        var tokens = query.Length / dimensions;
        var rows = page.Length / dimensions;
        var result = new (int, double)[tokens];
        for (var q = 0; q < tokens; q++)
        {
            var best = double.NegativeInfinity;
            var bestIndex = -1;
            for (var p = 0; p < rows; p++)
            {
                double dot = 0;
                for (var i = 0; i < dimensions; i++)
                {
                    dot += (double)query[(q * dimensions) + i] * page[(p * dimensions) + i];
                }

                if (dot > best)
                {
                    best = dot;
                    bestIndex = p;
                }
            }

            result[q] = (bestIndex, best);
        }

        return result;
    }

    /// <summary>Hamming MaxSim from the signs themselves, one component at a time.</summary>
    public static int Hamming(float[] query, float[] page, int dimensions)
    {
        var tokens = query.Length / dimensions;
        var rows = page.Length / dimensions;
        var score = 0;
        for (var q = 0; q < tokens; q++)
        {
            var fewest = int.MaxValue;
            for (var p = 0; p < rows; p++)
            {
                var differing = 0;
                for (var i = 0; i < dimensions; i++)
                {
                    if ((query[(q * dimensions) + i] >= 0) != (page[(p * dimensions) + i] >= 0))
                    {
                        differing++;
                    }
                }

                fewest = Math.Min(fewest, differing);
            }

            score += dimensions - (2 * fewest);
        }

        return score;
    }

    /// <summary>The float16 rounding of a vector, back in float32 (IEEE 754 binary16 via System.Half).</summary>
    public static float[] ThroughHalf(float[] vector) => vector.Select(x => (float)(Half)x).ToArray();
}
