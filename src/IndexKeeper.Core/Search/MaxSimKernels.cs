using System.Numerics;
using System.Numerics.Tensors;
using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;

namespace IndexKeeper.Core.Search;

/// <summary>
/// The two MaxSim scores of late interaction (Khattab &amp; Zaharia, ColBERT, SIGIR 2020): for each query
/// token the best page vector, summed over the query tokens. They use only the caller's buffers. Compiled fully
/// optimised at first use: a first search after a start runs them over every page, too long to spend in the
/// runtime's quick first tier.
/// </summary>
internal static class MaxSimKernels
{
    /// <summary>Page rows converted from float16 at a time; 64 rows of 128 floats are 32 KiB, in cache.</summary>
    public const int BlockRows = 64;

    /// <summary>
    /// Hamming MaxSim on sign codes: per query token the page code with the fewest differing bits, scored
    /// d − 2·distance (the dot product of the two ±1 vectors), summed.
    /// </summary>
    /// <param name="closest">Scratch of at least one entry per query token.</param>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public static int Hamming(ReadOnlySpan<ulong> queryCodes, ReadOnlySpan<ulong> pageCodes, int dimensions, Span<int> closest)
    {
        var words = dimensions / 64;
        var tokens = queryCodes.Length / words;
        var rows = pageCodes.Length / words;
        var best = closest[..tokens];
        best.Fill(int.MaxValue);
        if (words == 2)
        {
            ClosestTwoWords(queryCodes, pageCodes, best);
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
    /// Per query token the fewest differing bits from any page code, for d = 128 (two words a code): four tokens at a
    /// time with their codes and running minima in registers, so a page's codes are read once per four tokens and no
    /// bound is checked per row (the codes of both spans are taken whole). A last group of fewer tokens repeats its
    /// last token.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private static void ClosestTwoWords(ReadOnlySpan<ulong> queryCodes, ReadOnlySpan<ulong> pageCodes, Span<int> best)
    {
        var tokens = best.Length;
        var rows = pageCodes.Length / 2;
        ref var page = ref MemoryMarshal.GetReference(pageCodes);
        for (var q = 0; q < tokens; q += 4)
        {
            var (t0, t1, t2, t3) = (q, Math.Min(q + 1, tokens - 1), Math.Min(q + 2, tokens - 1), Math.Min(q + 3, tokens - 1));
            var (a0, a1) = (queryCodes[2 * t0], queryCodes[(2 * t0) + 1]);
            var (b0, b1) = (queryCodes[2 * t1], queryCodes[(2 * t1) + 1]);
            var (c0, c1) = (queryCodes[2 * t2], queryCodes[(2 * t2) + 1]);
            var (d0, d1) = (queryCodes[2 * t3], queryCodes[(2 * t3) + 1]);
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

    /// <summary>
    /// Exact MaxSim of float32 query rows against float16 page rows, converted block by block into
    /// <paramref name="block"/> (at least <see cref="BlockRows"/>·d floats). Fills, per query token, the best
    /// similarity and the index of the first page row that reached it.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
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
