using System.Numerics;
using IndexKeeper.Core.Search;
using IndexKeeper.Tests.Storage;

namespace IndexKeeper.Tests.Search;

/// <summary>
/// Every page's sign codes held by the serving view (docs/search.md, "Candidates") against the definition of the
/// first stage written out here by plain loops: a page's score is the sum over query tokens of d − 2·(fewest
/// differing bits from any of its rows) (Hamming distance as the angle estimate of sign codes, Charikar, STOC 2002).
/// </summary>
public sealed class PageCodesTests
{
    private const int Dimensions = 128;
    private const int Words = Dimensions / 64;

    [Fact]
    public void The_best_pages_are_those_of_the_plain_hamming_maxsim_also_after_removals_compact_the_rows()
    {
        var random = new Random(41);
        var codes = new PageCodes(Dimensions);
        var held = new Dictionary<ulong, ulong[]>();
        for (var p = 0; p < 3000; p++)
        {
            var rows = random.Next(0, 6);
            var page = Enumerable.Range(0, rows * Words).Select(_ => (ulong)random.NextInt64()).ToArray();
            codes.Add((ulong)p, page, rows);
            held[(ulong)p] = page;
        }

        // 1,600 removals pass the dead-slot limit (more than a quarter of the slots and 1,024); the owner compacts.
        for (var p = 0; p < 3000; p += 2)
        {
            codes.Remove((ulong)p);
            held.Remove((ulong)p);
        }

        codes.Remove(1);
        held.Remove(1);
        Assert.True(codes.CompactionDue);
        var moves = 0;
        codes.Compact((_, _, _, _) => moves++);
        Assert.Equal(held.Count, moves);
        Assert.False(codes.CompactionDue);
        Assert.Equal(held.Count, codes.Count);
        Assert.Equal(held.Count, codes.Slots);
        Assert.Equal(held.Values.Sum(v => v.Length / Words), codes.Rows);
        for (var slot = 0; slot < codes.Slots; slot++)
        {
            Assert.Equal(held[codes.IdOf(slot)], codes.CodesOf(slot).ToArray());
        }

        var query = Enumerable.Range(0, 3 * Words).Select(_ => (ulong)random.NextInt64()).ToArray();
        var best = codes.Best(query, 25, null, null, CancellationToken.None);
        var plain = held.Where(h => h.Value.Length > 0).ToDictionary(h => h.Key, h => Plain(query, h.Value));

        // Scores are integers, so ties are common: the best 25 scores must be those chosen (any page of a tied score may come).
        Assert.Equal(plain.Values.OrderDescending().Take(25), best.Select(id => plain[id]).OrderDescending());
        Assert.Equal(25, best.Distinct().Count());
        Assert.All(best, id => Assert.True(plain.ContainsKey(id), $"page {id} has no rows but was ranked"));

        // Only pages the filter allows are scored.
        var odd = codes.Best(query, 10, null, id => id % 4 == 1, CancellationToken.None);
        Assert.All(odd, id => Assert.Equal(1UL, id % 4));
        Assert.Equal(plain.Where(p => p.Key % 4 == 1).Select(p => p.Value).OrderDescending().Take(10), odd.Select(id => plain[id]).OrderDescending());
    }

    [Fact]
    public void Distinct_rows_keep_the_first_of_each_in_order_and_every_page_its_plain_score()
    {
        var (kept, rows) = PageCodes.Distinct([1, 2, 3, 4, 1, 2, 5, 6, 3, 4, 1, 3], 6, Dimensions);
        Assert.Equal(4, rows);
        Assert.Equal([1UL, 2UL, 3UL, 4UL, 5UL, 6UL, 1UL, 3UL], kept);

        // Pages of rows drawn from a small pool repeat many of them; their distinct rows must rank as all their rows do.
        var random = new Random(43);
        var pool = Enumerable.Range(0, 40 * Words).Select(_ => (ulong)random.NextInt64()).ToArray();
        var codes = new PageCodes(Dimensions);
        var plain = new Dictionary<ulong, int>();
        var query = Enumerable.Range(0, 3 * Words).Select(_ => (ulong)random.NextInt64()).ToArray();
        for (var p = 0; p < 500; p++)
        {
            var picks = Enumerable.Range(0, random.Next(1, 30)).Select(_ => random.Next(40)).ToArray();
            var page = picks.SelectMany(i => pool.AsSpan(i * Words, Words).ToArray()).ToArray();
            var distinct = PageCodes.Distinct(page, picks.Length, Dimensions);
            Assert.Equal(picks.Distinct().SelectMany(i => pool.AsSpan(i * Words, Words).ToArray()), distinct.Codes);
            Assert.Equal(picks.Distinct().Count(), distinct.Rows);
            codes.Add((ulong)p, distinct.Codes, distinct.Rows);
            plain[(ulong)p] = Plain(query, page);
        }

        var best = codes.Best(query, 50, null, null, CancellationToken.None);
        Assert.Equal(plain.Values.OrderDescending().Take(50), best.Select(id => plain[id]).OrderDescending());
    }

    [Fact]
    public void Restored_codes_are_read_back_page_by_page_and_parts_that_do_not_fit_are_refused()
    {
        var restored = PageCodes.Restore(Dimensions, [7, 9], [1, 2], [1, 2, 3, 4, 5, 6], 3);
        Assert.Equal([1UL, 2UL], restored.CodesOf(0).ToArray());
        Assert.Equal([3UL, 4UL, 5UL, 6UL], restored.CodesOf(1).ToArray());
        Assert.True(restored.Contains(9));

        Assert.Throws<FormatException>(() => PageCodes.Restore(Dimensions, [7, 9], [1, 2], [1, 2, 3, 4], 2));
        Assert.Throws<FormatException>(() => PageCodes.Restore(Dimensions, [7, 9], [1, 2], [1, 2, 3, 4], 3));
        Assert.Throws<FormatException>(() => PageCodes.Restore(Dimensions, [7, 7], [1, 1], [1, 2, 3, 4], 2));
        Assert.Throws<FormatException>(() => PageCodes.Restore(Dimensions, [7], [1, 2], [1, 2], 1));
    }

    [Fact]
    public void Restored_codes_with_room_take_added_pages_into_the_same_array()
    {
        // The room past the stored rows is what a view read from its file keeps for the commits that follow: no copy.
        var array = new ulong[] { 1, 2, 0, 0, 0, 0 };
        var restored = PageCodes.Restore(Dimensions, [7], [1], array, 1);
        Assert.Equal(3, restored.Capacity);
        restored.Add(8, [3UL, 4UL, 5UL, 6UL], 2);
        Assert.Same(array, restored.AllCodes);
        Assert.Equal([1UL, 2UL], restored.CodesOf(restored.SlotOf(7)).ToArray());
        Assert.Equal([3UL, 4UL, 5UL, 6UL], restored.CodesOf(restored.SlotOf(8)).ToArray());

        // Past the room the codes move to a larger array, every row kept.
        restored.Add(9, [7UL, 8UL], 1);
        Assert.NotSame(array, restored.AllCodes);
        Assert.True(restored.Capacity >= 4);
        Assert.Equal([1UL, 2UL], restored.CodesOf(restored.SlotOf(7)).ToArray());
        Assert.Equal([3UL, 4UL, 5UL, 6UL], restored.CodesOf(restored.SlotOf(8)).ToArray());
        Assert.Equal([7UL, 8UL], restored.CodesOf(restored.SlotOf(9)).ToArray());
    }

    // The definition: per query token the fewest differing bits from any row (a page without rows has no score).
    private static int Plain(ulong[] query, ulong[] page)
    {
        var score = 0;
        for (var q = 0; q < query.Length / Words; q++)
        {
            var fewest = int.MaxValue;
            for (var r = 0; r < page.Length / Words; r++)
            {
                var bits = 0;
                for (var w = 0; w < Words; w++)
                {
                    bits += BitOperations.PopCount(query[(q * Words) + w] ^ page[(r * Words) + w]);
                }

                fewest = Math.Min(fewest, bits);
            }

            score += Dimensions - (2 * fewest);
        }

        return score;
    }
}
