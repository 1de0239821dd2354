using System.Buffers.Binary;
using System.Security.Cryptography;
using TextEncoding = System.Text.Encoding;

namespace IndexKeeper.Core.Documents.Ocr;

/// <summary>
/// OCR words kept by page key, so a page is recognised once however many files and re-reads hold it
/// (format in docs/readers.md, "OCR cache"). One file per page key and OCR identity (program version,
/// languages, resolution): a Tesseract upgrade or another language list misses and recognises again.
/// A file that fails its checks is a miss, never an error; files are written to a temporary name and renamed.
/// </summary>
internal sealed class OcrCache(string directory, string identity)
{
    /// <summary>Version of the cache file layout; must equal docs/readers.md. Never reuse a number.</summary>
    public const uint Version = 1;

    private static ReadOnlySpan<byte> Magic => "IKOCRW\r\n"u8;

    private readonly string suffix = Convert.ToHexStringLower(SHA256.HashData(TextEncoding.UTF8.GetBytes(identity)))[..16];

    public IReadOnlyList<PageWord>? TryGet(PageKey key)
    {
        var path = PathOf(key);
        byte[] bytes;
        try
        {
            bytes = File.ReadAllBytes(path);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            return null;
        }

        return Decode(bytes);
    }

    public void Put(PageKey key, IReadOnlyList<PageWord> words)
    {
        var path = PathOf(key);
        try
        {
            Directory.CreateDirectory(Path.GetDirectoryName(path)!);
            var temporary = path + "." + Guid.NewGuid().ToString("N") + ".tmp";
            File.WriteAllBytes(temporary, Encode(words));
            File.Move(temporary, path, overwrite: true);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            // A cache that cannot be written costs a second recognition later, nothing more.
        }
    }

    internal static byte[] Encode(IReadOnlyList<PageWord> words)
    {
        using var body = new MemoryStream();
        body.Write(Magic);
        Span<byte> number = stackalloc byte[4];
        BinaryPrimitives.WriteUInt32BigEndian(number, Version);
        body.Write(number);
        BinaryPrimitives.WriteUInt32BigEndian(number, (uint)words.Count);
        body.Write(number);
        foreach (var word in words)
        {
            var text = TextEncoding.UTF8.GetBytes(word.Text);
            BinaryPrimitives.WriteUInt32BigEndian(number, (uint)text.Length);
            body.Write(number);
            body.Write(text);
            foreach (var value in new[] { word.Box.Left, word.Box.Bottom, word.Box.Right, word.Box.Top })
            {
                BinaryPrimitives.WriteSingleBigEndian(number, value);
                body.Write(number);
            }
        }

        body.Write(SHA256.HashData(body.GetBuffer().AsSpan(0, (int)body.Length)));
        return body.ToArray();
    }

    internal static IReadOnlyList<PageWord>? Decode(ReadOnlySpan<byte> bytes)
    {
        if (bytes.Length < Magic.Length + 8 + 32 || !bytes.StartsWith(Magic))
        {
            return null;
        }

        var body = bytes[..^32];
        if (!SHA256.HashData(body).AsSpan().SequenceEqual(bytes[^32..]) || BinaryPrimitives.ReadUInt32BigEndian(body[Magic.Length..]) != Version)
        {
            return null;
        }

        var at = Magic.Length + 4;
        var count = BinaryPrimitives.ReadUInt32BigEndian(body[at..]);
        at += 4;
        var words = new List<PageWord>();
        for (var i = 0u; i < count; i++)
        {
            if (body.Length - at < 4)
            {
                return null;
            }

            var length = (int)BinaryPrimitives.ReadUInt32BigEndian(body[at..]);
            at += 4;
            if (length < 0 || body.Length - at < length + 16)
            {
                return null;
            }

            var text = TextEncoding.UTF8.GetString(body.Slice(at, length));
            at += length;
            var box = new PageBox(
                BinaryPrimitives.ReadSingleBigEndian(body[at..]),
                BinaryPrimitives.ReadSingleBigEndian(body[(at + 4)..]),
                BinaryPrimitives.ReadSingleBigEndian(body[(at + 8)..]),
                BinaryPrimitives.ReadSingleBigEndian(body[(at + 12)..]));
            at += 16;
            words.Add(new PageWord(text, box));
        }

        return at == body.Length ? words : null;
    }

    private string PathOf(PageKey key) => Path.Combine(directory, key.Hex[..2], key.Hex + "-" + suffix + ".words");
}
