using IndexKeeper.Core.Search;
using IndexKeeper.Tests.Storage;

namespace IndexKeeper.Tests.Search;

/// <summary>
/// The centroid lists (docs/search.md, "Candidates") against the definitions they implement, computed here by
/// plain loops: spherical k-means (Dhillon and Modha, Machine Learning 42, 2001: unit centroids, each iteration
/// never lowers the summed best dot product), nearest-centroid assignment and PLAID's centroid interaction
/// (Santhanam et al., CIKM 2022, §4: per query token the best centroid score among a passage's centroid ids, summed).
/// </summary>
public sealed class CentroidListsTests
{
    private const int Dimensions = 64;

    [Fact]
    public void Training_gives_unit_centroids_that_fit_the_sample_at_least_as_well_as_the_initial_ones()
    {
        var sample = Normalised(TestVectors.Set(7, 600, Dimensions).Vectors);
        var lists = CentroidLists.Train(sample, Dimensions, 16, CancellationToken.None);
        Assert.Equal(16, lists.CentroidCount);
        var centroids = lists.Centroids.ToArray();
        for (var c = 0; c < 16; c++)
        {
            Assert.Equal(1.0, Math.Sqrt(centroids.Skip(c * Dimensions).Take(Dimensions).Sum(x => (double)x * x)), 4);
        }

        // The initial centroids are the sample rows at an even stride (600 / 16).
        var initial = Enumerable.Range(0, 16).SelectMany(c => sample.Skip(c * 600 / 16 * Dimensions).Take(Dimensions)).ToArray();
        Assert.True(Fit(sample, centroids) >= Fit(sample, initial) - 1e-3);
    }

    [Fact]
    public void A_page_keeps_the_distinct_assigned_centroids_of_its_vectors()
    {
        // The rule: of the 16 centroids whose sign codes differ in the fewest bits (ties to the lower id), the one
        // with the largest dot product. With the shortlist as long as the centroids it is the nearest centroid.
        var lists = CentroidLists.Train(Normalised(TestVectors.Set(8, 400, Dimensions).Vectors), Dimensions, 32, CancellationToken.None);
        var page = Normalised(TestVectors.Set(9, 50, Dimensions).Vectors);
        var centroids = lists.Centroids.ToArray();
        var expected = Enumerable.Range(0, 50).Select(r =>
        {
            var row = page.AsSpan(r * Dimensions, Dimensions).ToArray();
            return (ushort)Enumerable.Range(0, 32)
                .OrderBy(c => Enumerable.Range(0, Dimensions).Count(i => (row[i] >= 0) != (centroids[(c * Dimensions) + i] >= 0)))
                .ThenBy(c => c)
                .Take(CentroidLists.Shortlist)
                .MaxBy(c => Dot(row, centroids.AsSpan(c * Dimensions, Dimensions)));
        }).Distinct().Order();
        var halves = page.Select(v => (Half)v).ToArray();
        var codes = new ulong[50 * Dimensions / 64];
        SignCodes.Compute([.. halves.Select(h => (float)h)], Dimensions, codes);
        Assert.Equal(expected, lists.Assign(halves, codes));
    }

    [Fact]
    public void Candidates_are_the_pages_of_the_probed_lists_ranked_by_centroid_interaction()
    {
        var lists = CentroidLists.Train(Normalised(TestVectors.Set(10, 800, Dimensions).Vectors), Dimensions, 24, CancellationToken.None);
        var pages = Enumerable.Range(0, 120).Select(p => (Id: (ulong)(p + 1), Codes: Assign(lists, Normalised(TestVectors.Set(100 + p, 8, Dimensions).Vectors)))).ToList();
        foreach (var (id, codes) in pages)
        {
            lists.Add(id, codes);
        }

        var query = Normalised(TestVectors.Set(11, 3, Dimensions).Vectors).Select(v => (float)(Half)v).ToArray();
        var centroids = lists.Centroids.ToArray();
        var table = Enumerable.Range(0, 3).Select(q => Enumerable.Range(0, 24).Select(c => Dot(query.AsSpan(q * Dimensions, Dimensions), centroids.AsSpan(c * Dimensions, Dimensions))).ToArray()).ToArray();
        // Each token probes the centroid it would be assigned to and the best other by dot product (2 probes).
        var assigned = Assign(lists, query);
        var probed = table.SelectMany(row => row.Select((score, c) => (score, c)).OrderByDescending(x => x.score).Take(1).Select(x => x.c)).Concat(assigned.Select(c => (int)c)).ToHashSet();
        var expected = pages
            .Where(p => p.Codes.Any(c => probed.Contains(c)))
            .Select(p => (p.Id, Score: table.Sum(row => p.Codes.Max(c => row[c]))))
            .OrderByDescending(p => p.Score)
            .Take(15)
            .Select(p => p.Id);

        Assert.Equal(expected, lists.Nearest(query, probes: 2, count: 15, CancellationToken.None));
    }

    [Fact]
    public void Removed_pages_leave_the_lists_also_after_the_tombstones_are_cleared()
    {
        var lists = CentroidLists.Train(Normalised(TestVectors.Set(12, 300, Dimensions).Vectors), Dimensions, 8, CancellationToken.None);
        for (var p = 0; p < 1500; p++)
        {
            lists.Add((ulong)p, [(ushort)(p % 8)]);
        }

        // 1,100 removals pass the tombstone limit (more than 1,024 dead), so the lists are rebuilt on the way.
        for (var p = 0; p < 1100; p++)
        {
            lists.Remove((ulong)p);
        }

        Assert.Equal(400, lists.Count);
        var everything = lists.Nearest(Normalised(TestVectors.Set(13, 2, Dimensions).Vectors), probes: 8, count: 2000, CancellationToken.None);
        Assert.Equal(Enumerable.Range(1100, 400).Select(p => (ulong)p).Order(), everything.Order());
        Assert.Null(lists.CodesOf(5));
        Assert.Equal([(ushort)(1200 % 8)], lists.CodesOf(1200)!);
    }

    [Theory]
    [InlineData(1_000L, 64)]
    [InlineData(1_300_000L, 2048)]
    [InlineData(13_000_000L, 4096)]
    public void The_centroid_count_is_a_power_of_two_near_twice_the_root_of_the_vectors(long vectors, int expected) =>
        Assert.Equal(expected, CentroidLists.CentroidsFor(vectors));

    private static ushort[] Assign(CentroidLists lists, float[] rows)
    {
        var halves = rows.Select(v => (Half)v).ToArray();
        var codes = new ulong[rows.Length / 64];
        SignCodes.Compute([.. halves.Select(h => (float)h)], Dimensions, codes);
        return lists.Assign(halves, codes);
    }

    private static float[] Normalised(float[] rows)
    {
        var result = (float[])rows.Clone();
        for (var r = 0; r < rows.Length / Dimensions; r++)
        {
            var row = result.AsSpan(r * Dimensions, Dimensions);
            var norm = (float)Math.Sqrt(Dot(row, row));
            for (var i = 0; i < Dimensions; i++)
            {
                row[i] /= norm;
            }
        }

        return result;
    }

    private static float Dot(ReadOnlySpan<float> a, ReadOnlySpan<float> b)
    {
        var sum = 0f;
        for (var i = 0; i < a.Length; i++)
        {
            sum += a[i] * b[i];
        }

        return sum;
    }

    private static int Nearest(float[] row, float[] centroids)
    {
        var best = 0;
        for (var c = 1; c < centroids.Length / Dimensions; c++)
        {
            if (Dot(row, centroids.AsSpan(c * Dimensions, Dimensions)) > Dot(row, centroids.AsSpan(best * Dimensions, Dimensions)))
            {
                best = c;
            }
        }

        return best;
    }

    private static double Fit(float[] sample, float[] centroids) =>
        Enumerable.Range(0, sample.Length / Dimensions).Sum(r => (double)Dot(sample.AsSpan(r * Dimensions, Dimensions), centroids.AsSpan(Nearest(sample.AsSpan(r * Dimensions, Dimensions).ToArray(), centroids) * Dimensions, Dimensions)));
}
