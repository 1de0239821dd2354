using System.Buffers;
using System.Buffers.Binary;
using System.Security.Cryptography;
using TextEncoding = System.Text.Encoding;

namespace IndexKeeper.Core.Documents.Pdf;

/// <summary>
/// Writes the tagged, length-prefixed records of the canonical form (docs/page-keys.md, "Values").
/// Every value starts with a tag byte and every variable-length payload with its length, so no two
/// different sequences of values share bytes. Tags reach the page key: never change them.
/// </summary>
internal sealed class CanonicalWriter
{
    public const byte NumberTag = (byte)'N';
    public const byte StringTag = (byte)'S';
    public const byte NameTag = (byte)'/';
    public const byte BooleanTag = (byte)'B';
    public const byte NullTag = (byte)'Z';
    public const byte ArrayTag = (byte)'[';
    public const byte DictionaryTag = (byte)'<';
    public const byte StreamTag = (byte)'s';
    public const byte HashTag = (byte)'H';
    public const byte BackReferenceTag = (byte)'^';
    public const byte OperationTag = (byte)'o';
    public const byte ResourceTag = (byte)'R';
    public const byte MissingResourceTag = (byte)'r';
    public const byte EndTag = (byte)'.';
    public const byte KeywordTag = (byte)'k';

    private readonly ArrayBufferWriter<byte> buffer = new(256);

    public int Length => buffer.WrittenCount;

    public ReadOnlySpan<byte> WrittenSpan => buffer.WrittenSpan;

    public void Raw(ReadOnlySpan<byte> bytes) => buffer.Write(bytes);

    public void UInt32(uint value)
    {
        BinaryPrimitives.WriteUInt32BigEndian(buffer.GetSpan(4), value);
        buffer.Advance(4);
    }

    public void UInt64(ulong value)
    {
        BinaryPrimitives.WriteUInt64BigEndian(buffer.GetSpan(8), value);
        buffer.Advance(8);
    }

    public void Byte(byte value)
    {
        buffer.GetSpan(1)[0] = value;
        buffer.Advance(1);
    }

    /// <summary>A number already in canonical decimal text (see <see cref="CanonicalNumber"/>).</summary>
    public void Number(string canonicalDecimal) => Tagged(NumberTag, TextEncoding.ASCII.GetBytes(canonicalDecimal));

    public void String(ReadOnlySpan<byte> bytes) => Tagged(StringTag, bytes);

    public void Name(ReadOnlySpan<byte> bytes) => Tagged(NameTag, bytes);

    public void Name(string name) => Name(TextEncoding.UTF8.GetBytes(name));

    public void Keyword(ReadOnlySpan<byte> bytes) => Tagged(KeywordTag, bytes);

    public void Boolean(bool value)
    {
        Byte(BooleanTag);
        Byte(value ? (byte)1 : (byte)0);
    }

    public void Null() => Byte(NullTag);

    public void End() => Byte(EndTag);

    /// <summary>A 32-byte content hash standing for a composite value or a resource.</summary>
    public void Hash(ReadOnlySpan<byte> sha256)
    {
        Byte(HashTag);
        Raw(sha256);
    }

    /// <summary>A reference back to the object <paramref name="distance"/> levels up the current path (a cycle).</summary>
    public void BackReference(int distance)
    {
        Byte(BackReferenceTag);
        UInt32((uint)distance);
    }

    public void Tagged(byte tag, ReadOnlySpan<byte> payload)
    {
        Byte(tag);
        UInt32((uint)payload.Length);
        Raw(payload);
    }

    public byte[] Sha256() => SHA256.HashData(buffer.WrittenSpan);
}
