using System.Numerics;
using System.Numerics.Tensors;
using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;

namespace IndexKeeper.Core.Search;

/// <summary>
/// The two MaxSim scores of late interaction (Khattab &amp; Zaharia, ColBERT, SIGIR 2020): for each query
/// token the best page vector, summed over the query tokens. They use only the caller's buffers.
/// </summary>
internal static class MaxSimKernels
{
    /// <summary>Page rows converted from float16 at a time; 64 rows of 128 floats are 32 KiB, in cache.</summary>
    public const int BlockRows = 64;

    // Query tokens in their own order, for the kernels that take an order (longer queries make their own).
    private static readonly int[] InOrder = [.. Enumerable.Range(0, 1024)];

    /// <summary>
    /// Hamming MaxSim on sign codes: per query token the page code with the fewest differing bits, scored
    /// d − 2·distance (the dot product of the two ±1 vectors), summed.
    /// </summary>
    /// <param name="closest">Scratch of at least one entry per query token.</param>
    public static int Hamming(ReadOnlySpan<ulong> queryCodes, ReadOnlySpan<ulong> pageCodes, int dimensions, Span<int> closest)
    {
        var words = dimensions / 64;
        var tokens = queryCodes.Length / words;
        var rows = pageCodes.Length / words;
        var best = closest[..tokens];
        best.Fill(int.MaxValue);
        if (words == 2)
        {
            ClosestTwoWords(queryCodes, tokens <= InOrder.Length ? InOrder.AsSpan(0, tokens) : [.. Enumerable.Range(0, tokens)], pageCodes, best);
        }
        else
        {
            for (var p = 0; p < rows; p++)
            {
                var page = pageCodes.Slice(p * words, words);
                for (var q = 0; q < tokens; q++)
                {
                    var query = queryCodes.Slice(q * words, words);
                    var distance = 0;
                    for (var w = 0; w < words; w++)
                    {
                        distance += BitOperations.PopCount(page[w] ^ query[w]);
                    }

                    if (distance < best[q])
                    {
                        best[q] = distance;
                    }
                }
            }
        }

        var score = 0;
        foreach (var distance in best)
        {
            score += dimensions - (2 * distance);
        }

        return score;
    }

    /// <summary>
    /// Hamming MaxSim as <see cref="Hamming"/>, the tokens taken in <paramref name="order"/> a group at a time, the
    /// page given up as soon as it cannot reach <paramref name="floor"/>: after each group the sum so far plus d for
    /// every token left is an upper bound of the page's score, and a page whose bound is below the floor could not
    /// enter the caller's best (MaxScore's early termination, Turtle and Flood, "Query evaluation: strategies and
    /// optimizations", Information Processing &amp; Management 31(6), 1995, with d as every token's maximum score).
    /// A group is up to four tokens with their codes in registers, one pass over the page, and leaves the last token
    /// for a group of its own so that there is a bound to check (three tokens: two, then one).
    /// </summary>
    /// <param name="closest">Scratch of at least one entry per query token.</param>
    /// <returns>The score, or <see cref="int.MinValue"/> when the page was given up (its score is below the floor).</returns>
    public static int HammingAbove(ReadOnlySpan<ulong> queryCodes, ReadOnlySpan<int> order, ReadOnlySpan<ulong> pageCodes, int dimensions, Span<int> closest, float floor)
    {
        var words = dimensions / 64;
        var rows = pageCodes.Length / words;
        var left = order.Length * dimensions;
        var score = 0;
        for (var at = 0; at < order.Length;)
        {
            var group = order.Length - at == 1 ? 1 : Math.Min(4, order.Length - at - 1);
            var tokens = order.Slice(at, group);
            var best = closest[..group];
            if (words == 2)
            {
                ClosestTwoWords(queryCodes, tokens, pageCodes, best);
            }
            else
            {
                for (var i = 0; i < group; i++)
                {
                    var query = queryCodes.Slice(tokens[i] * words, words);
                    best[i] = dimensions;
                    for (var r = 0; r < rows; r++)
                    {
                        var distance = 0;
                        for (var w = 0; w < words; w++)
                        {
                            distance += BitOperations.PopCount(pageCodes[(r * words) + w] ^ query[w]);
                        }

                        best[i] = Math.Min(best[i], distance);
                    }
                }
            }

            foreach (var distance in best)
            {
                // A page with no rows scores −d a token, the lowest possible.
                score += dimensions - (2 * Math.Min(distance, dimensions));
            }

            at += group;
            left -= group * dimensions;
            if (score + left < floor)
            {
                return int.MinValue;
            }
        }

        return score;
    }

    /// <summary>
    /// Per query token named in <paramref name="order"/> (by position there) the fewest differing bits from any page
    /// code, for d = 128 (two words a code): four tokens at a time with their codes and running minima in registers, so a page's codes are read once per four tokens and no
    /// bound is checked per row (the codes of both spans are taken whole). A last group of three repeats its last
    /// token; one or two left have loops of their own.
    /// </summary>
    private static void ClosestTwoWords(ReadOnlySpan<ulong> queryCodes, ReadOnlySpan<int> order, ReadOnlySpan<ulong> pageCodes, Span<int> best)
    {
        var tokens = best.Length;
        var rows = pageCodes.Length / 2;
        ref var page = ref MemoryMarshal.GetReference(pageCodes);
        for (var q = 0; q < tokens; q += 4)
        {
            if (tokens - q <= 2)
            {
                // One or two left: their own loop, not four registers of which half repeat.
                ClosestOneOrTwo(queryCodes, order, pageCodes, best, q);
                return;
            }

            var (t0, t1, t2, t3) = (q, Math.Min(q + 1, tokens - 1), Math.Min(q + 2, tokens - 1), Math.Min(q + 3, tokens - 1));
            var (a0, a1) = (queryCodes[2 * order[t0]], queryCodes[(2 * order[t0]) + 1]);
            var (b0, b1) = (queryCodes[2 * order[t1]], queryCodes[(2 * order[t1]) + 1]);
            var (c0, c1) = (queryCodes[2 * order[t2]], queryCodes[(2 * order[t2]) + 1]);
            var (d0, d1) = (queryCodes[2 * order[t3]], queryCodes[(2 * order[t3]) + 1]);
            int bestA = int.MaxValue, bestB = int.MaxValue, bestC = int.MaxValue, bestD = int.MaxValue;
            for (var r = 0; r < rows; r++)
            {
                var low = Unsafe.Add(ref page, 2 * r);
                var high = Unsafe.Add(ref page, (2 * r) + 1);
                bestA = Math.Min(bestA, BitOperations.PopCount(low ^ a0) + BitOperations.PopCount(high ^ a1));
                bestB = Math.Min(bestB, BitOperations.PopCount(low ^ b0) + BitOperations.PopCount(high ^ b1));
                bestC = Math.Min(bestC, BitOperations.PopCount(low ^ c0) + BitOperations.PopCount(high ^ c1));
                bestD = Math.Min(bestD, BitOperations.PopCount(low ^ d0) + BitOperations.PopCount(high ^ d1));
            }

            best[t0] = bestA;
            best[t1] = bestB;
            best[t2] = bestC;
            best[t3] = bestD;
        }
    }

    /// <summary>The last one or two tokens of <see cref="ClosestTwoWords"/>, from position <paramref name="q"/> of <paramref name="order"/>.</summary>
    private static void ClosestOneOrTwo(ReadOnlySpan<ulong> queryCodes, ReadOnlySpan<int> order, ReadOnlySpan<ulong> pageCodes, Span<int> best, int q)
    {
        var rows = pageCodes.Length / 2;
        ref var page = ref MemoryMarshal.GetReference(pageCodes);
        var (a0, a1) = (queryCodes[2 * order[q]], queryCodes[(2 * order[q]) + 1]);
        var bestA = int.MaxValue;
        if (best.Length - q == 1)
        {
            for (var r = 0; r < rows; r++)
            {
                bestA = Math.Min(bestA, BitOperations.PopCount(Unsafe.Add(ref page, 2 * r) ^ a0) + BitOperations.PopCount(Unsafe.Add(ref page, (2 * r) + 1) ^ a1));
            }

            best[q] = bestA;
            return;
        }

        var (b0, b1) = (queryCodes[2 * order[q + 1]], queryCodes[(2 * order[q + 1]) + 1]);
        var bestB = int.MaxValue;
        for (var r = 0; r < rows; r++)
        {
            var low = Unsafe.Add(ref page, 2 * r);
            var high = Unsafe.Add(ref page, (2 * r) + 1);
            bestA = Math.Min(bestA, BitOperations.PopCount(low ^ a0) + BitOperations.PopCount(high ^ a1));
            bestB = Math.Min(bestB, BitOperations.PopCount(low ^ b0) + BitOperations.PopCount(high ^ b1));
        }

        best[q] = bestA;
        best[q + 1] = bestB;
    }

    /// <summary>
    /// Exact MaxSim of float32 query rows against float16 page rows, converted block by block into
    /// <paramref name="block"/> (at least <see cref="BlockRows"/>·d floats). Fills, per query token, the best
    /// similarity and the index of the first page row that reached it.
    /// </summary>
    public static float Exact(ReadOnlySpan<float> query, ReadOnlySpan<Half> page, int dimensions, Span<float> block, Span<float> bestSimilarity, Span<int> bestIndex)
    {
        var tokens = query.Length / dimensions;
        var rows = page.Length / dimensions;
        var best = bestSimilarity[..tokens];
        var index = bestIndex[..tokens];
        best.Fill(float.NegativeInfinity);
        index.Fill(-1);
        for (var start = 0; start < rows; start += BlockRows)
        {
            var count = Math.Min(BlockRows, rows - start);
            var converted = block[..(count * dimensions)];
            TensorPrimitives.ConvertToSingle(page.Slice(start * dimensions, count * dimensions), converted);
            for (var r = 0; r < count; r++)
            {
                var row = converted.Slice(r * dimensions, dimensions);
                var q = 0;
                if (Vector256.IsHardwareAccelerated && dimensions % Vector256<float>.Count == 0)
                {
                    for (; q + 4 <= tokens; q += 4)
                    {
                        Dot4(row, query.Slice(q * dimensions, 4 * dimensions), out var d0, out var d1, out var d2, out var d3);
                        Update(best, index, q, d0, start + r);
                        Update(best, index, q + 1, d1, start + r);
                        Update(best, index, q + 2, d2, start + r);
                        Update(best, index, q + 3, d3, start + r);
                    }
                }

                for (; q < tokens; q++)
                {
                    Update(best, index, q, TensorPrimitives.Dot(row, query.Slice(q * dimensions, dimensions)), start + r);
                }
            }
        }

        var score = 0f;
        foreach (var similarity in best)
        {
            score += similarity;
        }

        return score;
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static void Update(Span<float> best, Span<int> index, int q, float similarity, int row)
    {
        if (similarity > best[q])
        {
            best[q] = similarity;
            index[q] = row;
        }
    }

    // One page row against four query rows: the row is loaded once per step for four accumulators.
    private static void Dot4(ReadOnlySpan<float> row, ReadOnlySpan<float> queries, out float d0, out float d1, out float d2, out float d3)
    {
        var dimensions = row.Length;
        ref var p = ref MemoryMarshal.GetReference(row);
        ref var q = ref MemoryMarshal.GetReference(queries);
        var a0 = Vector256<float>.Zero;
        var a1 = Vector256<float>.Zero;
        var a2 = Vector256<float>.Zero;
        var a3 = Vector256<float>.Zero;
        for (var i = 0; i < dimensions; i += Vector256<float>.Count)
        {
            var x = Vector256.LoadUnsafe(ref p, (nuint)i);
            a0 = Vector256.FusedMultiplyAdd(x, Vector256.LoadUnsafe(ref q, (nuint)i), a0);
            a1 = Vector256.FusedMultiplyAdd(x, Vector256.LoadUnsafe(ref q, (nuint)(dimensions + i)), a1);
            a2 = Vector256.FusedMultiplyAdd(x, Vector256.LoadUnsafe(ref q, (nuint)((2 * dimensions) + i)), a2);
            a3 = Vector256.FusedMultiplyAdd(x, Vector256.LoadUnsafe(ref q, (nuint)((3 * dimensions) + i)), a3);
        }

        d0 = Vector256.Sum(a0);
        d1 = Vector256.Sum(a1);
        d2 = Vector256.Sum(a2);
        d3 = Vector256.Sum(a3);
    }
}
