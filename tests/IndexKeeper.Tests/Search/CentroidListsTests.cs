using IndexKeeper.Core.Search;
using IndexKeeper.Tests.Storage;

namespace IndexKeeper.Tests.Search;

/// <summary>
/// The centroid lists (docs/search.md, "Candidates") against the definitions they implement, computed here by
/// plain loops: spherical k-means (Dhillon and Modha, Machine Learning 42, 2001: unit centroids that fit the
/// sample better than where they started), the assignment rule, and approximate MaxSim over the probed lists with
/// missing similarities imputed (Santhanam et al., PLAID, CIKM 2022; Scheerer et al., WARP, SIGIR 2025).
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
    public void Each_vector_goes_to_the_nearest_of_the_centroids_closest_by_sign_code()
    {
        // The rule: of the 16 centroids whose sign codes differ in the fewest bits (ties to the lower id), the one
        // with the largest dot product.
        var lists = CentroidLists.Train(Normalised(TestVectors.Set(8, 400, Dimensions).Vectors), Dimensions, 32, CancellationToken.None);
        var page = Rounded(Normalised(TestVectors.Set(9, 50, Dimensions).Vectors));
        var centroids = lists.Centroids.ToArray();
        var expected = Enumerable.Range(0, 50).Select(r =>
        {
            var row = page.AsSpan(r * Dimensions, Dimensions).ToArray();
            return (ushort)Enumerable.Range(0, 32)
                .OrderBy(c => Enumerable.Range(0, Dimensions).Count(i => (row[i] >= 0) != (centroids[(c * Dimensions) + i] >= 0)))
                .ThenBy(c => c)
                .Take(CentroidLists.Shortlist)
                .MaxBy(c => Dot(row, centroids.AsSpan(c * Dimensions, Dimensions)));
        });
        Assert.Equal(expected, lists.Assign([.. page.Select(v => (Half)v)], Codes(page)));
    }

    [Fact]
    public void Candidates_rank_the_probed_entries_by_approximate_maxsim_with_missing_tokens_imputed()
    {
        // The definition written out: per query token the entries of its assigned centroid's list, scored by the
        // sign codes' dot product (d − 2·Hamming); per page the best entry of each token, or for a token with no
        // entry on the page the lowest score the token saw; summed.
        var lists = CentroidLists.Train(Normalised(TestVectors.Set(10, 800, Dimensions).Vectors), Dimensions, 24, CancellationToken.None);
        var pages = Enumerable.Range(0, 120).Select(p => (Id: (ulong)(p + 1), Rows: Rounded(Normalised(TestVectors.Set(100 + p, 8, Dimensions).Vectors)))).ToList();
        var entries = new List<(int Centroid, ulong Id, int Row, float[] Vector)>();
        foreach (var (id, rows) in pages)
        {
            var assigned = lists.Assign([.. rows.Select(v => (Half)v)], Codes(rows));
            lists.Add(id, assigned, Codes(rows));
            entries.AddRange(assigned.Select((c, r) => ((int)c, id, r, rows.AsSpan(r * Dimensions, Dimensions).ToArray())));
        }

        var query = Rounded(Normalised(TestVectors.Set(11, 3, Dimensions).Vectors));
        var tokenCentroids = lists.Assign([.. query.Select(v => (Half)v)], Codes(query));
        var scores = new Dictionary<ulong, int[]>();
        var lowest = new int[3];
        for (var q = 0; q < 3; q++)
        {
            var token = query.AsSpan(q * Dimensions, Dimensions).ToArray();
            var probed = entries.Where(e => e.Centroid == tokenCentroids[q]).Select(e => (e.Id, Score: Dimensions - (2 * Enumerable.Range(0, Dimensions).Count(i => (token[i] >= 0) != (e.Vector[i] >= 0))))).ToList();
            lowest[q] = probed.Count == 0 ? 0 : probed.Min(p => p.Score);
            foreach (var (id, score) in probed)
            {
                var row = scores.TryGetValue(id, out var found) ? found : scores[id] = [int.MinValue, int.MinValue, int.MinValue];
                row[q] = Math.Max(row[q], score);
            }
        }

        var expected = scores
            .Select(p => (p.Key, Total: Enumerable.Range(0, 3).Sum(q => p.Value[q] == int.MinValue ? lowest[q] : p.Value[q])))
            .OrderByDescending(p => p.Total)
            .ThenBy(p => p.Key)
            .Take(10)
            .Select(p => p.Key);

        Assert.Equal(expected, lists.ListRanked(query, probes: 1, count: 10, CancellationToken.None));

        // The pages handed on are then ranked by Hamming MaxSim over all their vectors (per token the page vector
        // with the fewest differing sign bits, d − 2·Hamming, summed), ties to the better list rank.
        var handed = lists.ListRanked(query, probes: 1, count: 30, CancellationToken.None);
        var full = handed
            .Select((id, rank) => (Id: id, Rank: rank, Score: Enumerable.Range(0, 3).Sum(q => entries.Where(e => e.Id == id)
                .Max(e => Dimensions - (2 * Enumerable.Range(0, Dimensions).Count(i => (query[(q * Dimensions) + i] >= 0) != (e.Vector[i] >= 0)))))))
            .OrderByDescending(p => p.Score)
            .ThenBy(p => p.Rank)
            .Take(10)
            .Select(p => p.Id);
        Assert.Equal(full, lists.Nearest(query, probes: 1, handedOn: 30, count: 10, CancellationToken.None, listEntryCost: 0));

        // At the default cost the probed lists here hold more than a tenth of all vectors, so reading them costs
        // more than reading every page's codes: every page is ranked by Hamming MaxSim, ties to the earlier page.
        var probedEntries = entries.Count(e => tokenCentroids.Contains((ushort)e.Centroid));
        Assert.True((probedEntries * CentroidLists.ListEntryCost) + (entries.Count * 30 / pages.Count) >= entries.Count);
        var every = pages
            .Select((p, slot) => (p.Id, Slot: slot, Score: Enumerable.Range(0, 3).Sum(q => entries.Where(e => e.Id == p.Id)
                .Max(e => Dimensions - (2 * Enumerable.Range(0, Dimensions).Count(i => (query[(q * Dimensions) + i] >= 0) != (e.Vector[i] >= 0)))))))
            .OrderByDescending(p => p.Score)
            .ThenBy(p => p.Slot)
            .Take(10)
            .Select(p => p.Id);
        Assert.Equal(every, lists.Nearest(query, probes: 1, handedOn: 30, count: 10, CancellationToken.None));
    }

    [Fact]
    public void Removed_pages_leave_the_lists_also_after_the_tombstones_are_cleared()
    {
        var lists = CentroidLists.Train(Normalised(TestVectors.Set(12, 300, Dimensions).Vectors), Dimensions, 8, CancellationToken.None);
        for (var p = 0; p < 1500; p++)
        {
            lists.Add((ulong)p, [(ushort)(p % 8)], [(ulong)p]);
        }

        // 1,100 removals pass the tombstone limit (more than 1,024 dead), so the lists are compacted on the way.
        for (var p = 0; p < 1100; p++)
        {
            lists.Remove((ulong)p);
        }

        Assert.Equal(400, lists.Count);
        var everything = lists.ListRanked(Normalised(TestVectors.Set(13, 2, Dimensions).Vectors), probes: 8, count: 2000, CancellationToken.None);
        Assert.Equal(Enumerable.Range(1100, 400).Select(p => (ulong)p).Order(), everything.Order());
        Assert.False(lists.Contains(5));

        // Every page left keeps its own vector: its centroid and its code (both made from its id above).
        var live = Enumerable.Range(0, lists.Slots).Where(lists.IsLive).ToList();
        Assert.Equal(Enumerable.Range(1100, 400).Select(p => (ulong)p), live.Select(lists.IdOf));
        Assert.All(live, slot => Assert.Equal([(ushort)(lists.IdOf(slot) % 8)], lists.CentroidsOf(slot).ToArray()));
        Assert.All(live, slot => Assert.Equal([lists.IdOf(slot)], lists.CodesOf(slot).ToArray()));
    }

    [Theory]
    [InlineData(1_000L, 64)]
    [InlineData(1_300_000L, 1024)]
    [InlineData(13_000_000L, 4096)]
    public void The_centroid_count_is_a_power_of_two_near_the_root_of_the_vectors(long vectors, int expected) =>
        Assert.Equal(expected, CentroidLists.CentroidsFor(vectors));

    /// <summary>Rows as float16 stores them, so page and query sides see the same values.</summary>
    private static float[] Rounded(float[] rows) => [.. rows.Select(v => (float)(Half)v)];

    private static ulong[] Codes(float[] rows)
    {
        var codes = new ulong[rows.Length / 64];
        SignCodes.Compute(rows, Dimensions, codes);
        return codes;
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
