using System.Numerics.Tensors;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;

namespace IndexKeeper.Core.Storage;

/// <summary>
/// The element types a segment stores: float16 (IEEE 754-2008 binary16, round to nearest even, as
/// <see cref="Half"/> converts) and 1-bit sign codes — bit <c>i % 64</c> of word <c>i / 64</c> of a
/// row's code is set when component <c>i</c> is ≥ 0 (so −0 and +0 both set it; NaN clears it).
/// </summary>
public static class VectorQuantization
{
    /// <summary>
    /// The stored element types in words, part of every encoder id (docs/encoders.md, "Encoder identity"):
    /// a change of how vectors are stored changes what search reads. Change it with the segment format.
    /// </summary>
    public const string StoredForm = "float16-binary16-nearest-even+sign-bits-64-per-word-lsb-first";

    public static int WordsPerCode(int dimensions)
    {
        if (dimensions <= 0 || dimensions % 64 != 0)
        {
            throw new ArgumentOutOfRangeException(nameof(dimensions), dimensions, "Sign codes need a positive multiple of 64 dimensions.");
        }

        return dimensions / 64;
    }

    public static Half[] ToFloat16(ReadOnlySpan<float> values)
    {
        var result = new Half[values.Length];
        ToFloat16(values, result);
        return result;
    }

    public static void ToFloat16(ReadOnlySpan<float> values, Span<Half> destination) => TensorPrimitives.ConvertToHalf(values, destination);

    /// <summary>Sign codes of row-major <paramref name="vectors"/>; a segment derives them from the stored float16 values.</summary>
    public static ulong[] SignCodes(ReadOnlySpan<Half> vectors, int dimensions)
    {
        var result = new ulong[CodeLength(vectors.Length, dimensions)];
        SignCodes(vectors, dimensions, result);
        return result;
    }

    public static void SignCodes(ReadOnlySpan<Half> vectors, int dimensions, Span<ulong> destination)
    {
        var words = CodeLength(vectors.Length, dimensions);
        if (destination.Length < words)
        {
            throw new ArgumentException($"Sign codes need {words} words.", nameof(destination));
        }

        // On the bit pattern (IEEE 754-2008 §3.4): x ≥ 0 exactly for +0 up to +infinity (0x0000..0x7C00)
        // and for −0 (0x8000); NaNs and negatives fail. Eight components per compare, 64 per word.
        var bits = MemoryMarshal.Cast<Half, ushort>(vectors);
        var positiveLimit = Vector128.Create((ushort)0x7C00);
        var negativeZero = Vector128.Create((ushort)0x8000);
        for (var word = 0; word < words; word++)
        {
            var components = bits.Slice(word * 64, 64);
            ulong code = 0;
            for (var lane = 0; lane < 8; lane++)
            {
                var pattern = Vector128.Create(components.Slice(lane * 8, 8));
                var set = Vector128.LessThanOrEqual(pattern, positiveLimit) | Vector128.Equals(pattern, negativeZero);
                code |= (ulong)set.ExtractMostSignificantBits() << (lane * 8);
            }

            destination[word] = code;
        }
    }

    /// <summary>Sign codes of float rows (for query vectors, which are never stored).</summary>
    public static ulong[] SignCodes(ReadOnlySpan<float> vectors, int dimensions)
    {
        var result = new ulong[CodeLength(vectors.Length, dimensions)];
        for (var word = 0; word < result.Length; word++)
        {
            var components = vectors.Slice(word * 64, 64);
            ulong code = 0;
            for (var bit = 0; bit < 64; bit++)
            {
                if (components[bit] >= 0f)
                {
                    code |= 1UL << bit;
                }
            }

            result[word] = code;
        }

        return result;
    }

    private static int CodeLength(int components, int dimensions)
    {
        var words = WordsPerCode(dimensions);
        if (components % dimensions != 0)
        {
            throw new ArgumentException($"{components} components do not form rows of {dimensions}.");
        }

        return components / dimensions * words;
    }
}
