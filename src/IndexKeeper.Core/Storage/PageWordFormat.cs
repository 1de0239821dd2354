using System.Buffers.Binary;
using IndexKeeper.Core.Documents;

namespace IndexKeeper.Core.Storage;

/// <summary>
/// The page-word file format, version 1 (docs/page-words-format.md; <see cref="Version"/> matches it): a
/// header, then records framed as body length, CRC-32C of the body, body. Values reach disk: never change them.
/// </summary>
internal static class PageWordFormat
{
    public const int Version = 1;

    public const string Folder = "words";

    public const string Extension = ".words";

    /// <summary>Magic (4), version (i32), file id (i64).</summary>
    public const int HeaderLength = 16;

    /// <summary>Body length (u32) and body CRC-32C (u32).</summary>
    public const int FrameLength = 8;

    /// <summary>A word's text is at most this many UTF-8 bytes (its length is a u16); longer text is cut at a character.</summary>
    public const int MaxTextBytes = ushort.MaxValue;

    private static ReadOnlySpan<byte> Magic => "IKPW"u8;

    public static string FileName(long id) => "words-" + id.ToString("D6", System.Globalization.CultureInfo.InvariantCulture) + Extension;

    /// <summary>The id of a file named by <see cref="FileName"/>; null for any other name.</summary>
    public static long? IdOf(string fileName) =>
        fileName.StartsWith("words-", StringComparison.Ordinal) && fileName.EndsWith(Extension, StringComparison.Ordinal)
        && long.TryParse(fileName.AsSpan(6, fileName.Length - 6 - Extension.Length), System.Globalization.NumberStyles.None, System.Globalization.CultureInfo.InvariantCulture, out var id)
            ? id
            : null;

    public static byte[] Header(long id)
    {
        var header = new byte[HeaderLength];
        Magic.CopyTo(header);
        BinaryPrimitives.WriteInt32LittleEndian(header.AsSpan(4), Version);
        BinaryPrimitives.WriteInt64LittleEndian(header.AsSpan(8), id);
        return header;
    }

    /// <summary>Null when <paramref name="header"/> is a version-1 header of file <paramref name="id"/>, else what is wrong.</summary>
    public static string? CheckHeader(ReadOnlySpan<byte> header, long id)
    {
        if (header.Length < HeaderLength || !header[..4].SequenceEqual(Magic))
        {
            return "not a page-word file";
        }

        var version = BinaryPrimitives.ReadInt32LittleEndian(header[4..]);
        if (version != Version)
        {
            return $"page-word format version {version}; this build reads version {Version}";
        }

        return BinaryPrimitives.ReadInt64LittleEndian(header[8..]) == id ? null : "the header names another file id";
    }

    /// <summary>One framed record: the page key and its words in reading order.</summary>
    public static byte[] Encode(PageKey key, IReadOnlyList<PageWord> words, out uint checksum)
    {
        var texts = words.Select(w => Text(w.Text)).ToList();
        var bodyLength = PageKey.ByteLength + 4 + texts.Sum(t => 2 + t.Length + 16);
        var record = new byte[FrameLength + bodyLength];
        var body = record.AsSpan(FrameLength);
        key.ToBytes().CopyTo(body);
        var at = PageKey.ByteLength;
        BinaryPrimitives.WriteInt32LittleEndian(body[at..], words.Count);
        at += 4;
        for (var i = 0; i < words.Count; i++)
        {
            BinaryPrimitives.WriteUInt16LittleEndian(body[at..], (ushort)texts[i].Length);
            texts[i].CopyTo(body[(at + 2)..]);
            at += 2 + texts[i].Length;
            var box = words[i].Box;
            BinaryPrimitives.WriteSingleLittleEndian(body[at..], box.Left);
            BinaryPrimitives.WriteSingleLittleEndian(body[(at + 4)..], box.Bottom);
            BinaryPrimitives.WriteSingleLittleEndian(body[(at + 8)..], box.Right);
            BinaryPrimitives.WriteSingleLittleEndian(body[(at + 12)..], box.Top);
            at += 16;
        }

        checksum = Crc32C.Compute(body);
        BinaryPrimitives.WriteUInt32LittleEndian(record, (uint)bodyLength);
        BinaryPrimitives.WriteUInt32LittleEndian(record.AsSpan(4), checksum);
        return record;
    }

    /// <summary>Decodes a framed record read at <paramref name="location"/>; throws <see cref="InvalidDataException"/> on any mismatch.</summary>
    public static List<PageWord> Decode(ReadOnlySpan<byte> record, PageWordsLocation location, PageKey expected, string file)
    {
        string Where() => $"{file} at offset {location.Offset}";
        if (record.Length != location.Length || record.Length < FrameLength + PageKey.ByteLength + 4
            || BinaryPrimitives.ReadUInt32LittleEndian(record) != (uint)(record.Length - FrameLength))
        {
            throw new InvalidDataException($"The page words of {expected.Hex} in {Where()} are cut short or framed wrongly.");
        }

        var body = record[FrameLength..];
        var checksum = Crc32C.Compute(body);
        if (checksum != location.Checksum || checksum != BinaryPrimitives.ReadUInt32LittleEndian(record[4..]))
        {
            throw new InvalidDataException($"The page words of {expected.Hex} in {Where()} fail their CRC-32C check.");
        }

        if (!body[..PageKey.ByteLength].SequenceEqual(expected.ToBytes()))
        {
            throw new InvalidDataException($"The record in {Where()} holds the words of another page than {expected.Hex}.");
        }

        var count = BinaryPrimitives.ReadInt32LittleEndian(body[PageKey.ByteLength..]);
        var words = new List<PageWord>(Math.Max(0, Math.Min(count, body.Length / 18)));
        var at = PageKey.ByteLength + 4;
        for (var i = 0; i < count; i++)
        {
            var length = BinaryPrimitives.ReadUInt16LittleEndian(body[at..]);
            var text = System.Text.Encoding.UTF8.GetString(body.Slice(at + 2, length));
            at += 2 + length;
            var box = new PageBox(
                BinaryPrimitives.ReadSingleLittleEndian(body[at..]),
                BinaryPrimitives.ReadSingleLittleEndian(body[(at + 4)..]),
                BinaryPrimitives.ReadSingleLittleEndian(body[(at + 8)..]),
                BinaryPrimitives.ReadSingleLittleEndian(body[(at + 12)..]));
            at += 16;
            words.Add(new PageWord(text, box));
        }

        return words;
    }

    private static byte[] Text(string text)
    {
        var bytes = System.Text.Encoding.UTF8.GetBytes(text);
        if (bytes.Length <= MaxTextBytes)
        {
            return bytes;
        }

        // Cut at the start of a UTF-8 sequence so the stored text stays valid.
        var cut = MaxTextBytes;
        while (cut > 0 && (bytes[cut] & 0xC0) == 0x80)
        {
            cut--;
        }

        return bytes[..cut];
    }
}
