using System.Buffers.Binary;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Tests.Storage;

/// <summary>
/// The page-word store: what is appended reads back exactly, the bytes follow docs/page-words-format.md
/// (parsed here by the document's grammar, not by the store's code), and every damage is refused by its
/// checks rather than read as words.
/// </summary>
public sealed class PageWordStoreTests : IDisposable
{
    private readonly TempDirectory temp = new();

    private static readonly PageKey First = PageKey.Of("first page"u8);
    private static readonly PageKey Second = PageKey.Of("second page"u8);

    private static readonly PageWord[] FirstWords =
    [
        new("Settling", new PageBox(72, 700, 130.5f, 712)),
        new("tank", new PageBox(134, 700, 160, 712)),
        new("Ørsted-7", new PageBox(164, 700, 220, 712)),
    ];

    [Fact]
    public void Appended_words_read_back_exactly_and_a_page_without_words_reads_empty()
    {
        using var store = PageWordStore.OpenForWriting(temp.Path);
        var at = store.Append([(First, FirstWords), (Second, [])]);

        Assert.Equal(FirstWords, store.Read(First, at[0]));
        Assert.Empty(store.Read(Second, at[1]));
        using var reader = PageWordStore.OpenForReading(temp.Path);
        Assert.Equal(FirstWords, reader.Read(First, at[0]));
    }

    [Fact]
    public void The_file_follows_the_documented_layout()
    {
        PageWordsLocation at;
        using (var store = PageWordStore.OpenForWriting(temp.Path))
        {
            at = store.Append([(First, FirstWords)])[0];
        }

        var bytes = File.ReadAllBytes(Path.Combine(temp.Path, "words", "words-000001.words"));
        Assert.Equal("IKPW"u8.ToArray(), bytes[..4]);
        Assert.Equal(1, BinaryPrimitives.ReadInt32LittleEndian(bytes.AsSpan(4)));
        Assert.Equal(1, BinaryPrimitives.ReadInt64LittleEndian(bytes.AsSpan(8)));
        Assert.Equal(16, at.Offset);

        var bodyLength = BinaryPrimitives.ReadInt32LittleEndian(bytes.AsSpan(16));
        Assert.Equal(bytes.Length - 24, bodyLength);
        Assert.Equal(at.Length, 8 + bodyLength);
        var body = bytes.AsSpan(24);
        Assert.Equal(First.ToBytes(), body[..32].ToArray());
        Assert.Equal(3, BinaryPrimitives.ReadInt32LittleEndian(body[32..]));
        var textLength = BinaryPrimitives.ReadUInt16LittleEndian(body[36..]);
        Assert.Equal("Settling", System.Text.Encoding.UTF8.GetString(body.Slice(38, textLength)));
        Assert.Equal(130.5f, BinaryPrimitives.ReadSingleLittleEndian(body[(38 + textLength + 8)..]));

        // CRC-32C of the body, checked with the RFC 3720 §B.4 test vector in Crc32CTests.
        Assert.Equal(BinaryPrimitives.ReadUInt32LittleEndian(bytes.AsSpan(20)), at.Checksum);
    }

    [Fact]
    public void The_worked_example_of_the_format_document_holds()
    {
        // docs/page-words-format.md, "Worked example": one word "Weir" at (72, 700)–(96, 712).
        PageWordsLocation at;
        using (var store = PageWordStore.OpenForWriting(temp.Path))
        {
            at = store.Append([(First, [new PageWord("Weir", new PageBox(72, 700, 96, 712))])])[0];
        }

        var file = new FileInfo(Path.Combine(temp.Path, "words", "words-000001.words"));
        Assert.Equal((1L, 16L, 66), (at.File, at.Offset, at.Length));
        Assert.Equal(82, file.Length);
    }

    [Fact]
    public void A_flipped_byte_a_wrong_key_a_cut_file_and_a_missing_file_are_refused()
    {
        PageWordsLocation at;
        using (var store = PageWordStore.OpenForWriting(temp.Path))
        {
            at = store.Append([(First, FirstWords)])[0];
        }

        using var reader = PageWordStore.OpenForReading(temp.Path);
        Assert.Throws<InvalidDataException>(() => reader.Read(Second, at));
        Assert.Throws<InvalidDataException>(() => reader.Read(First, at with { Checksum = at.Checksum ^ 1 }));
        Assert.Throws<InvalidDataException>(() => reader.Read(First, at with { File = 7 }));

        var path = Path.Combine(temp.Path, "words", "words-000001.words");
        var bytes = File.ReadAllBytes(path);
        bytes[^3] ^= 0x20;
        File.WriteAllBytes(path, bytes);
        Assert.Contains("CRC-32C", Assert.Throws<InvalidDataException>(() => reader.Read(First, at)).Message, StringComparison.Ordinal);

        File.WriteAllBytes(path, bytes[..^5]);
        Assert.Throws<InvalidDataException>(() => reader.Read(First, at));
    }

    [Fact]
    public void Each_writing_open_starts_a_file_after_the_highest_and_never_appends_to_an_old_one()
    {
        using (var store = PageWordStore.OpenForWriting(temp.Path))
        {
            store.Append([(First, FirstWords)]);
        }

        var old = File.ReadAllBytes(Path.Combine(temp.Path, "words", "words-000001.words"));
        using (var store = PageWordStore.OpenForWriting(temp.Path))
        {
            Assert.Equal(2, store.Append([(Second, FirstWords)])[0].File);
        }

        Assert.Equal(old, File.ReadAllBytes(Path.Combine(temp.Path, "words", "words-000001.words")));
    }

    public void Dispose() => temp.Dispose();
}
