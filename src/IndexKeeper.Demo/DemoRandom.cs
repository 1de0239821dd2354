using System.Buffers.Binary;
using System.Security.Cryptography;
using System.Text;

namespace IndexKeeper.Demo;

/// <summary>
/// SplitMix64 (Steele, Lea and Flood, 2014; reference code splitmix64.c by Vigna). Our own generator rather
/// than System.Random, whose seeded sequence is not promised to stay the same across .NET versions.
/// Only integer arithmetic, so every platform draws the same numbers.
/// </summary>
internal sealed class DemoRandom
{
    private ulong state;

    public DemoRandom(ulong seed) => state = seed;

    /// <summary>An independent stream for one purpose (a document, a page), so that adding or reordering
    /// documents does not shift the numbers any other document draws.</summary>
    public static DemoRandom For(int seed, string purpose)
    {
        Span<byte> digest = stackalloc byte[32];
        SHA256.HashData(Encoding.UTF8.GetBytes(string.Create(System.Globalization.CultureInfo.InvariantCulture, $"{seed}/{purpose}")), digest);
        return new DemoRandom(BinaryPrimitives.ReadUInt64LittleEndian(digest));
    }

    public ulong NextUInt64()
    {
        ulong z = state += 0x9E3779B97F4A7C15UL;
        z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9UL;
        z = (z ^ (z >> 27)) * 0x94D049BB133111EBUL;
        return z ^ (z >> 31);
    }

    /// <summary>A number in [0, maxExclusive), without modulo bias (rejection of the short last range).</summary>
    public int Next(int maxExclusive)
    {
        ArgumentOutOfRangeException.ThrowIfNegativeOrZero(maxExclusive);
        ulong bound = (ulong)maxExclusive;
        ulong limit = ulong.MaxValue - (ulong.MaxValue % bound);
        ulong value;
        do
        {
            value = NextUInt64();
        }
        while (value >= limit);
        return (int)(value % bound);
    }

    /// <summary>A number in [minInclusive, maxExclusive).</summary>
    public int Next(int minInclusive, int maxExclusive) => minInclusive + Next(maxExclusive - minInclusive);

    public bool Chance(int percent) => Next(100) < percent;

    public T Pick<T>(IReadOnlyList<T> items) => items[Next(items.Count)];

    /// <summary>A seed for a child stream drawn from this one.</summary>
    public DemoRandom Fork() => new(NextUInt64());
}
