using System.Text;

namespace IndexKeeper.Core.Detect;

/// <summary>
/// A lossless, reversible map between Linux path bytes and .NET strings. Linux names are bytes; .NET
/// decodes them as UTF-8 and replaces invalid bytes with U+FFFD, after which the file cannot be opened
/// by that name. Here every byte that is not part of a valid UTF-8 sequence becomes the private-use
/// character U+F700 + byte (U+F780..U+F7FF). So that the map stays one-to-one, a valid sequence that
/// itself decodes to a character of that range is escaped byte by byte too. The result is always valid
/// Unicode, so it survives storage as UTF-8 (the catalog) and comes back to the same bytes.
/// See docs/detect.md, "Names that are not UTF-8".
/// </summary>
internal static class LinuxPathCodec
{
    // Never change: names made with these values are stored in catalogs (docs/detect.md, name mapping v1).
    private const int EscapeBase = 0xF700;
    private const int EscapeFirst = 0xF780;
    private const int EscapeLast = 0xF7FF;

    private static readonly UTF8Encoding Strict = new(encoderShouldEmitUTF8Identifier: false, throwOnInvalidBytes: true);

    public static string Decode(ReadOnlySpan<byte> bytes)
    {
        if (!NeedsEscaping(bytes))
        {
            return Strict.GetString(bytes);
        }

        var text = new StringBuilder(bytes.Length);
        var rest = bytes;
        while (!rest.IsEmpty)
        {
            var status = System.Text.Rune.DecodeFromUtf8(rest, out var rune, out var consumed);
            if (status == System.Buffers.OperationStatus.Done && !IsEscapeRange(rune.Value))
            {
                text.Append(rune.ToString());
            }
            else
            {
                // Invalid or escape-range: one escape per byte of what was looked at.
                var take = status == System.Buffers.OperationStatus.Done ? consumed : Math.Max(consumed, 1);
                foreach (var b in rest[..take])
                {
                    text.Append((char)(EscapeBase + b));
                }

                consumed = take;
            }

            rest = rest[consumed..];
        }

        return text.ToString();
    }

    /// <summary>The bytes of <paramref name="path"/> followed by a NUL, ready for a libc call.</summary>
    public static byte[] EncodeTerminated(string path)
    {
        if (!path.AsSpan().ContainsAnyInRange((char)EscapeFirst, (char)EscapeLast))
        {
            var plain = new byte[System.Text.Encoding.UTF8.GetByteCount(path) + 1];
            System.Text.Encoding.UTF8.GetBytes(path, plain);
            return plain;
        }

        var bytes = new List<byte>(path.Length + 8);
        Span<byte> scratch = stackalloc byte[4];
        foreach (var rune in path.EnumerateRunes())
        {
            if (IsEscapeRange(rune.Value))
            {
                bytes.Add((byte)(rune.Value - EscapeBase));
            }
            else
            {
                var written = rune.EncodeToUtf8(scratch);
                for (var i = 0; i < written; i++)
                {
                    bytes.Add(scratch[i]);
                }
            }
        }

        bytes.Add(0);
        return [.. bytes];
    }

    private static bool NeedsEscaping(ReadOnlySpan<byte> bytes)
    {
        if (System.Text.Unicode.Utf8.IsValid(bytes))
        {
            // U+F780..U+F7FF encode as EF 9E 80..EF 9F BF.
            ReadOnlySpan<byte> low = [0xEF, 0x9E];
            ReadOnlySpan<byte> high = [0xEF, 0x9F];
            return bytes.IndexOf(low) >= 0 || bytes.IndexOf(high) >= 0;
        }

        return true;
    }

    private static bool IsEscapeRange(int scalar) => scalar is >= EscapeFirst and <= EscapeLast;
}
