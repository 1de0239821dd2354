using System.Buffers;
using System.Buffers.Binary;

namespace IndexKeeper.Core.Documents.Isolation;

/// <summary>Appends little-endian fields to a frame body.</summary>
internal sealed class BodyWriter
{
    private readonly ArrayBufferWriter<byte> buffer = new();

    public void WriteUInt16(ushort value) => BinaryPrimitives.WriteUInt16LittleEndian(Take(2), value);

    public void WriteInt32(int value) => BinaryPrimitives.WriteInt32LittleEndian(Take(4), value);

    public void WriteInt64(long value) => BinaryPrimitives.WriteInt64LittleEndian(Take(8), value);

    public void WriteSingle(float value) => BinaryPrimitives.WriteSingleLittleEndian(Take(4), value);

    public void WriteBytes(ReadOnlySpan<byte> value) => value.CopyTo(Take(value.Length));

    /// <summary>A string: its UTF-8 byte count as a 32-bit integer, then the bytes.</summary>
    public void WriteString(string value)
    {
        var count = System.Text.Encoding.UTF8.GetByteCount(value);
        WriteInt32(count);
        System.Text.Encoding.UTF8.GetBytes(value, Take(count));
    }

    public byte[] ToArray() => buffer.WrittenSpan.ToArray();

    private Span<byte> Take(int count)
    {
        var span = buffer.GetSpan(count)[..count];
        buffer.Advance(count);
        return span;
    }
}
