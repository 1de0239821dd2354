using System.Globalization;
using System.Text;

namespace IndexKeeper.Cli.Output;

/// <summary>
/// How text from the store (file and folder names, words on a page, parser messages) is shown on a
/// terminal: C0 and C1 control characters and DEL as <c>\xHH</c>, bidirectional controls as <c>\uHHHH</c>,
/// everything else as it is. A name may hold any byte but '/' and NUL, so unescaped it could carry ECMA-48
/// control functions (ESC [ ... moves the cursor, clears the screen, recolours; ESC ] ... sets the title;
/// U+009B is a one-character CSI) or reorder what follows it (Unicode UAX #9 overrides and isolates).
/// Backslashes are left alone: Windows paths keep their look, at the price of ambiguity with the escapes.
/// </summary>
internal static class TerminalText
{
    public static string Escape(string? text)
    {
        if (string.IsNullOrEmpty(text) || !text.Any(NeedsEscape))
        {
            return text ?? string.Empty;
        }

        var escaped = new StringBuilder(text.Length + 16);
        foreach (var c in text)
        {
            Append(escaped, c);
        }

        return escaped.ToString();
    }

    public static string Escape(char c) => NeedsEscape(c) ? Append(new StringBuilder(6), c).ToString() : c.ToString();

    private static StringBuilder Append(StringBuilder output, char c) =>
        !NeedsEscape(c) ? output.Append(c)
        : c <= '\u00ff' ? output.Append(CultureInfo.InvariantCulture, $"\\x{(int)c:X2}")
        : output.Append(CultureInfo.InvariantCulture, $"\\u{(int)c:X4}");

    /// <summary>C0 controls, DEL, C1 controls (ECMA-48 section 5), and the bidirectional formatting characters (UAX #9 section 2).</summary>
    private static bool NeedsEscape(char c) =>
        c < ' ' || c is >= '\u007f' and <= '\u009f' || c is '\u061c' or '\u200e' or '\u200f' || c is >= '\u202a' and <= '\u202e' || c is >= '\u2066' and <= '\u2069';
}
