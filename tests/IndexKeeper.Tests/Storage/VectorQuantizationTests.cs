using IndexKeeper.Core.Storage;

namespace IndexKeeper.Tests.Storage;

public sealed class VectorQuantizationTests
{
    // Expected encodings from IEEE 754-2008 §3.6 (binary16: 1 sign bit, 5 exponent bits with bias 15,
    // 10 fraction bits) and §4.3.1 (round to nearest, ties to even), worked out by hand.
    [Theory]
    [InlineData(1.0f, 0x3C00)]
    [InlineData(-2.0f, 0xC000)]
    [InlineData(65504.0f, 0x7BFF)] // largest finite
    [InlineData(5.9604644775390625e-8f, 0x0001)] // 2^-24, smallest subnormal
    [InlineData(6.103515625e-5f, 0x0400)] // 2^-14, smallest normal
    [InlineData(float.PositiveInfinity, 0x7C00)]
    [InlineData(float.NegativeInfinity, 0xFC00)]
    [InlineData(0.0f, 0x0000)]
    [InlineData(-0.0f, 0x8000)]
    [InlineData(1.00048828125f, 0x3C00)] // 1 + 2^-11: halfway between 0x3C00 and 0x3C01, ties to even
    [InlineData(1.00146484375f, 0x3C02)] // 1 + 3·2^-11: halfway between 0x3C01 and 0x3C02, ties to even
    [InlineData(1.0009765625f, 0x3C01)] // 1 + 2^-10, exact
    [InlineData(65520.0f, 0x7C00)] // halfway between 65504 and 2^16: ties to even overflows to infinity
    [InlineData(2.98023223876953125e-8f, 0x0000)] // 2^-25: halfway between 0 and 2^-24, ties to even
    [InlineData(0.5f, 0x3800)]
    public void ToFloat16_gives_binary16_bit_patterns(float value, int bits)
    {
        var converted = VectorQuantization.ToFloat16([value, value, value, value, value, value, value, value, value, value, value, value, value, value, value, value, value, value]);
        Assert.All(converted, h => Assert.Equal((ushort)bits, BitConverter.HalfToUInt16Bits(h)));
        Assert.Equal((ushort)bits, BitConverter.HalfToUInt16Bits((Half)value)); // System.Half as the reference library
    }

    [Fact]
    public void ToFloat16_matches_system_half_on_random_values()
    {
        var random = new Random(7);
        var values = Enumerable.Range(0, 4096).Select(_ => (float)((random.NextDouble() - 0.5) * Math.Pow(2, random.Next(-30, 18)))).ToArray();
        var converted = VectorQuantization.ToFloat16(values);
        for (var i = 0; i < values.Length; i++)
        {
            Assert.Equal(BitConverter.HalfToUInt16Bits((Half)values[i]), BitConverter.HalfToUInt16Bits(converted[i]));
        }
    }

    [Fact]
    public void Sign_codes_set_bit_i_mod_64_of_word_i_div_64_for_non_negative_components()
    {
        const int dimensions = 128;
        var vectors = new float[dimensions * 2];
        Array.Fill(vectors, -1f);
        vectors[0] = 0.5f; // row 0, word 0, bit 0
        vectors[63] = 0f; // row 0, word 0, bit 63 (zero counts as ≥ 0)
        vectors[64 + 5] = 2f; // row 0, word 1, bit 5
        vectors[dimensions + 127] = -0f; // row 1, word 1, bit 63 (−0 ≥ 0 in IEEE comparison)
        vectors[dimensions + 1] = float.NaN; // NaN is not ≥ 0
        var fromFloat = VectorQuantization.SignCodes(vectors, dimensions);
        var fromHalf = VectorQuantization.SignCodes(VectorQuantization.ToFloat16(vectors), dimensions);
        ulong[] expected = [1UL | (1UL << 63), 1UL << 5, 0, 1UL << 63];
        Assert.Equal(expected, fromFloat);
        Assert.Equal(expected, fromHalf);
    }

    [Fact]
    public void Sign_codes_of_float16_agree_with_ieee_comparison_for_every_bit_pattern()
    {
        // All 65,536 binary16 patterns, 64 to a row; System.Half's ≥ is the reference comparison.
        var all = Enumerable.Range(0, 65536).Select(i => BitConverter.UInt16BitsToHalf((ushort)i)).ToArray();
        var codes = VectorQuantization.SignCodes(all, 64);
        for (var i = 0; i < all.Length; i++)
        {
            Assert.Equal(all[i] >= Half.Zero, (codes[i / 64] >> (i % 64) & 1) == 1);
        }
    }

    [Fact]
    public void Sign_codes_reject_dimensions_not_a_multiple_of_64()
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => VectorQuantization.SignCodes(new float[96], 96));
        Assert.Throws<ArgumentException>(() => VectorQuantization.SignCodes(new float[100], 64));
    }
}
