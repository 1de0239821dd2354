namespace IndexKeeper.Core.Encoding.TextTokens;

/// <summary>
/// SplitMix64 (Steele, Lea and Flood, "Fast splittable pseudorandom number generators", OOPSLA 2014):
/// a fixed, documented generator, so the projection is the same in every process and runtime version
/// (unlike <see cref="Random"/>, whose seeded sequence the runtime does not promise to keep).
/// </summary>
internal static class SplitMix64
{
    public static ulong Next(ref ulong state)
    {
        state += 0x9e3779b97f4a7c15; // never change: part of the projection of the text-token encoder
        var z = state;
        z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9;
        z = (z ^ (z >> 27)) * 0x94d049bb133111eb;
        return z ^ (z >> 31);
    }
}
