using System.Text;
using TextEncoding = System.Text.Encoding;

namespace IndexKeeper.Core.Documents.Text;

/// <summary>
/// Bytes of a text file to lines: a byte-order mark names the encoding (and is dropped, it shows nothing);
/// without one, valid UTF-8 is UTF-8 and anything else is read as Latin-1 (ISO 8859-1), which accepts every
/// byte. CR LF, CR and LF all end a line, so a re-save with other line ends changes nothing.
/// </summary>
internal static class TextDecoding
{
    private static readonly UTF8Encoding StrictUtf8 = new(encoderShouldEmitUTF8Identifier: false, throwOnInvalidBytes: true);

    public static string Decode(byte[] file)
    {
        ReadOnlySpan<byte> bytes = file;
        if (bytes.StartsWith((ReadOnlySpan<byte>)[0xEF, 0xBB, 0xBF]))
        {
            return TextEncoding.UTF8.GetString(bytes[3..]);
        }

        if (bytes.StartsWith((ReadOnlySpan<byte>)[0xFF, 0xFE]))
        {
            return TextEncoding.Unicode.GetString(bytes[2..]);
        }

        if (bytes.StartsWith((ReadOnlySpan<byte>)[0xFE, 0xFF]))
        {
            return TextEncoding.BigEndianUnicode.GetString(bytes[2..]);
        }

        try
        {
            return StrictUtf8.GetString(bytes);
        }
        catch (DecoderFallbackException)
        {
            return TextEncoding.Latin1.GetString(bytes);
        }
    }

    /// <summary>Lines ended by CR LF, CR or LF only: a form feed stays in its line as a page break.</summary>
    public static IEnumerable<string> Lines(string text) => text.Replace("\r\n", "\n", StringComparison.Ordinal).Replace('\r', '\n').Split('\n');

    /// <summary>True when the bytes hold NUL bytes outside a UTF-16 text: a binary file, not text.</summary>
    public static bool LooksBinary(byte[] file)
    {
        ReadOnlySpan<byte> bytes = file;
        return !bytes.StartsWith((ReadOnlySpan<byte>)[0xFF, 0xFE]) && !bytes.StartsWith((ReadOnlySpan<byte>)[0xFE, 0xFF])
            && bytes[..Math.Min(bytes.Length, 1 << 16)].IndexOf((byte)0) >= 0;
    }
}
