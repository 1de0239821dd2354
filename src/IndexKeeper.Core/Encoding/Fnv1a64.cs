namespace IndexKeeper.Core.Encoding;

/// <summary>
/// 64-bit FNV-1a (draft-eastlake-fnv): a fixed, documented hash, so hashed-term vectors are the same in
/// every process and on every platform (unlike <see cref="string.GetHashCode()"/>, which is seeded per process).
/// </summary>
internal static class Fnv1a64
{
    public const ulong OffsetBasis = 0xcbf29ce484222325; // never change: part of hashed-term scheme 1
    public const ulong Prime = 0x100000001b3; // never change: part of hashed-term scheme 1

    public static ulong Hash(ReadOnlySpan<byte> data) => Append(OffsetBasis, data);

    /// <summary>Continues a hash over more bytes, as if they had followed the bytes already hashed.</summary>
    public static ulong Append(ulong state, ReadOnlySpan<byte> data)
    {
        foreach (var b in data)
        {
            state = (state ^ b) * Prime;
        }

        return state;
    }
}
