using System.Buffers.Binary;

namespace IndexKeeper.Tests.Encoding.PageImages;

/// <summary>
/// Writes Protocol Buffers messages field by field in the binary wire format (protobuf.dev, "Encoding"):
/// each field is a varint key (field number &lt;&lt; 3 | wire type) then its value — varint (type 0),
/// little-endian 32 bits (type 5), or a varint length and the bytes (type 2, strings, bytes, nested
/// messages and packed repeated numbers).
/// </summary>
internal sealed class ProtoWriter
{
    private readonly MemoryStream buffer = new();

    public byte[] ToArray() => buffer.ToArray();

    public ProtoWriter Int64(int field, long value)
    {
        Key(field, 0);
        Varint(unchecked((ulong)value));
        return this;
    }

    public ProtoWriter Float(int field, float value)
    {
        Key(field, 5);
        Span<byte> bytes = stackalloc byte[4];
        BinaryPrimitives.WriteSingleLittleEndian(bytes, value);
        buffer.Write(bytes);
        return this;
    }

    public ProtoWriter String(int field, string value) => Bytes(field, System.Text.Encoding.UTF8.GetBytes(value));

    public ProtoWriter Bytes(int field, byte[] value)
    {
        Key(field, 2);
        Varint((ulong)value.Length);
        buffer.Write(value);
        return this;
    }

    public ProtoWriter Message(int field, ProtoWriter message) => Bytes(field, message.ToArray());

    /// <summary>A packed repeated int64 field: one length-delimited run of varints.</summary>
    public ProtoWriter PackedInt64(int field, IEnumerable<long> values)
    {
        var inner = new ProtoWriter();
        foreach (var value in values)
        {
            inner.Varint(unchecked((ulong)value));
        }

        return Message(field, inner);
    }

    private void Key(int field, int wireType) => Varint(((ulong)field << 3) | (uint)wireType);

    // Base 128 varint: seven bits a byte, least significant group first, high bit set on all but the last.
    private void Varint(ulong value)
    {
        while (value >= 0x80)
        {
            buffer.WriteByte((byte)(value | 0x80));
            value >>= 7;
        }

        buffer.WriteByte((byte)value);
    }
}
