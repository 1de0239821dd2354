using System.Buffers.Binary;

namespace IndexKeeper.Core.Documents.Isolation;

/// <summary>
/// Reads little-endian fields from a frame body. Every read checks the bytes left, so a truncated or
/// lying body ends in <see cref="ReaderProtocolException"/>, never in an out-of-range read or a huge allocation.
/// </summary>
internal ref struct BodyReader(ReadOnlySpan<byte> body)
{
    private ReadOnlySpan<byte> rest = body;

    public readonly int Remaining => rest.Length;

    public ushort ReadUInt16() => BinaryPrimitives.ReadUInt16LittleEndian(Take(2));

    public int ReadInt32() => BinaryPrimitives.ReadInt32LittleEndian(Take(4));

    public long ReadInt64() => BinaryPrimitives.ReadInt64LittleEndian(Take(8));

    public float ReadSingle() => BinaryPrimitives.ReadSingleLittleEndian(Take(4));

    public ReadOnlySpan<byte> ReadBytes(int count) => Take(count);

    public string ReadString()
    {
        var count = ReadInt32();
        return System.Text.Encoding.UTF8.GetString(Take(count));
    }

    /// <summary>Reads a count of items that each take at least <paramref name="minimumItemBytes"/> bytes.</summary>
    public int ReadCount(int minimumItemBytes)
    {
        var count = ReadInt32();
        if (count < 0 || (long)count * minimumItemBytes > rest.Length)
        {
            throw new ReaderProtocolException($"count {count} does not fit in the {rest.Length} bytes left");
        }

        return count;
    }

    public readonly void EnsureEnd()
    {
        if (!rest.IsEmpty)
        {
            throw new ReaderProtocolException($"{rest.Length} unexpected bytes after the end of a body");
        }
    }

    private ReadOnlySpan<byte> Take(int count)
    {
        if (count < 0 || count > rest.Length)
        {
            throw new ReaderProtocolException($"body ends early: wanted {count} bytes, {rest.Length} left");
        }

        var taken = rest[..count];
        rest = rest[count..];
        return taken;
    }
}
