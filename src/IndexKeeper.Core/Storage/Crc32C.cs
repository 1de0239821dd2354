using System.Buffers.Binary;
using System.Numerics;

namespace IndexKeeper.Core.Storage;

/// <summary>
/// CRC-32C (Castagnoli, reflected polynomial 0x82F63B78) as RFC 3720 §B.4 defines it: initial value
/// all ones, final complement. Built on <see cref="BitOperations.Crc32C(uint, ulong)"/>, which uses the
/// CPU's CRC instruction where there is one, so no package is needed.
/// </summary>
internal static class Crc32C
{
    /// <summary>The checksum of <paramref name="data"/>.</summary>
    public static uint Compute(ReadOnlySpan<byte> data) => Append(0, data);

    /// <summary>
    /// The checksum of the concatenation of what gave <paramref name="crc"/> and <paramref name="data"/>;
    /// <c>Append(Compute(a), b) == Compute(a + b)</c>, so a writer can keep a running file checksum.
    /// </summary>
    public static uint Append(uint crc, ReadOnlySpan<byte> data)
    {
        var state = ~crc;
        while (data.Length >= sizeof(ulong))
        {
            state = BitOperations.Crc32C(state, BinaryPrimitives.ReadUInt64LittleEndian(data));
            data = data[sizeof(ulong)..];
        }

        foreach (var b in data)
        {
            state = BitOperations.Crc32C(state, b);
        }

        return ~state;
    }
}
