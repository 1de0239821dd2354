using System.Runtime.Intrinsics;
using IndexKeeper.Core.Documents;

namespace IndexKeeper.Core.Encoding;

/// <summary>
/// Pools near-duplicate vectors of one page: agglomerative clustering with Ward linkage (Lance–Williams
/// update on squared Euclidean distances) down to ⌈n / factor⌉ clusters; each cluster becomes the
/// renormalised mean of its members, with the union of their regions. Ties break towards lower indices and
/// the arithmetic has a fixed order (four-lane vectors, no fused multiply-add), so the result is the same on
/// every platform.
/// </summary>
internal static class VectorPooling
{
    /// <summary>The pooling algorithm in words, part of the encoder id; raise the version on any change that alters pooled vectors.</summary>
    public const string Scheme = "ward-lance-williams-renormalised-mean-v1";

    public static VectorSet Pool(VectorSet set, int factor)
    {
        ArgumentNullException.ThrowIfNull(set);
        ArgumentOutOfRangeException.ThrowIfLessThan(factor, 1);
        var n = set.Count;
        var target = (n + factor - 1) / factor;
        if (n <= target)
        {
            return set;
        }

        var root = Cluster(set, target);
        return Merge(set, root);
    }

    /// <summary>For each vector, the smallest index of its cluster.</summary>
    private static int[] Cluster(VectorSet set, int target)
    {
        var n = set.Count;
        var distance = new float[n * n];
        for (var i = 0; i < n; i++)
        {
            for (var j = i + 1; j < n; j++)
            {
                // Squared Euclidean distance of unit vectors.
                var d = Math.Max(0f, 2f - (2f * Dot(set.Row(i), set.Row(j))));
                distance[(i * n) + j] = d;
                distance[(j * n) + i] = d;
            }
        }

        var active = new bool[n];
        Array.Fill(active, true);
        var size = new int[n];
        Array.Fill(size, 1);
        var parent = new int[n];
        var nearest = new int[n];
        var nearestDistance = new float[n];
        for (var i = 0; i < n; i++)
        {
            parent[i] = i;
            FindNearest(i, distance, active, n, nearest, nearestDistance);
        }

        for (var clusters = n; clusters > target; clusters--)
        {
            var best = -1;
            for (var i = 0; i < n; i++)
            {
                if (active[i] && (best < 0 || nearestDistance[i] < nearestDistance[best]))
                {
                    best = i;
                }
            }

            // A cluster is named by its smallest member, so the survivor is the lower index.
            var a = Math.Min(best, nearest[best]);
            var b = Math.Max(best, nearest[best]);
            var dab = distance[(a * n) + b];
            for (var k = 0; k < n; k++)
            {
                if (!active[k] || k == a || k == b)
                {
                    continue;
                }

                var merged = (((size[a] + size[k]) * distance[(k * n) + a]) + ((size[b] + size[k]) * distance[(k * n) + b]) - (size[k] * dab))
                    / (size[a] + size[b] + size[k]);
                distance[(k * n) + a] = merged;
                distance[(a * n) + k] = merged;
            }

            size[a] += size[b];
            active[b] = false;
            parent[b] = a;
            for (var k = 0; k < n; k++)
            {
                if (!active[k] || k == a)
                {
                    continue;
                }

                if (nearest[k] == a || nearest[k] == b)
                {
                    FindNearest(k, distance, active, n, nearest, nearestDistance);
                }
                else if (distance[(k * n) + a] < nearestDistance[k] || (distance[(k * n) + a] == nearestDistance[k] && a < nearest[k]))
                {
                    nearest[k] = a;
                    nearestDistance[k] = distance[(k * n) + a];
                }
            }

            FindNearest(a, distance, active, n, nearest, nearestDistance);
        }

        var root = new int[n];
        for (var i = 0; i < n; i++)
        {
            var r = i;
            while (parent[r] != r)
            {
                r = parent[r];
            }

            root[i] = r;
        }

        return root;
    }

    private static void FindNearest(int i, float[] distance, bool[] active, int n, int[] nearest, float[] nearestDistance)
    {
        var best = -1;
        var bestDistance = float.PositiveInfinity;
        for (var j = 0; j < n; j++)
        {
            if (j != i && active[j] && distance[(i * n) + j] < bestDistance)
            {
                best = j;
                bestDistance = distance[(i * n) + j];
            }
        }

        nearest[i] = best;
        nearestDistance[i] = best < 0 ? float.PositiveInfinity : bestDistance;
    }

    private static VectorSet Merge(VectorSet set, int[] root)
    {
        var d = set.Dimensions;
        var index = new Dictionary<int, int>();
        foreach (var r in root)
        {
            index.TryAdd(r, index.Count);
        }

        var sums = new double[index.Count * d];
        var regions = new PageBox[index.Count];
        var first = new int[index.Count];
        var seen = new bool[index.Count];
        for (var i = 0; i < root.Length; i++)
        {
            var c = index[root[i]];
            var row = set.Row(i);
            for (var k = 0; k < d; k++)
            {
                sums[(c * d) + k] += row[k];
            }

            if (!seen[c])
            {
                first[c] = i;
                regions[c] = set.Regions[i];
                seen[c] = true;
            }
            else
            {
                regions[c] = PageBox.Union(regions[c], set.Regions[i]);
            }
        }

        var vectors = new float[sums.Length];
        for (var c = 0; c < index.Count; c++)
        {
            double squares = 0;
            for (var k = 0; k < d; k++)
            {
                squares += sums[(c * d) + k] * sums[(c * d) + k];
            }

            if (squares == 0)
            {
                // Only members that cancel exactly (forced merges of opposite vectors): keep the first one.
                set.Row(first[c]).CopyTo(vectors.AsSpan(c * d, d));
                continue;
            }

            var scale = 1.0 / Math.Sqrt(squares);
            for (var k = 0; k < d; k++)
            {
                vectors[(c * d) + k] = (float)(sums[(c * d) + k] * scale);
            }
        }

        return new VectorSet(d, vectors, regions);
    }

    // Fixed-order dot product: four lanes, then the lanes summed left to right.
    private static float Dot(ReadOnlySpan<float> x, ReadOnlySpan<float> y)
    {
        var accumulator = Vector128<float>.Zero;
        var i = 0;
        for (; i + 4 <= x.Length; i += 4)
        {
            accumulator += Vector128.Create(x.Slice(i, 4)) * Vector128.Create(y.Slice(i, 4));
        }

        var sum = ((accumulator[0] + accumulator[1]) + accumulator[2]) + accumulator[3];
        for (; i < x.Length; i++)
        {
            sum += x[i] * y[i];
        }

        return sum;
    }
}
