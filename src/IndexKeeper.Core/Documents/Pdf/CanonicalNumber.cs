using System.Globalization;
using TextEncoding = System.Text.Encoding;

namespace IndexKeeper.Core.Documents.Pdf;

/// <summary>
/// One spelling per numeric value: "1", "1.0", "+1.00" and "01" all become "1"; "-0" becomes "0";
/// ".5" becomes "0.5". Keeps decimal text exact instead of going through binary floating point.
/// </summary>
internal static class CanonicalNumber
{
    /// <summary>Canonical text of a PDF number token (ISO 32000-1 §7.3.3), or null if it is not one.</summary>
    public static string? FromPdfText(ReadOnlySpan<byte> text)
    {
        var i = 0;
        var negative = false;
        while (i < text.Length && (text[i] == (byte)'+' || text[i] == (byte)'-'))
        {
            // Repeated signs ("--5") are tolerated by common readers; an odd count of '-' is negative.
            negative ^= text[i] == (byte)'-';
            i++;
        }

        var integerStart = i;
        while (i < text.Length && IsDigit(text[i]))
        {
            i++;
        }

        var integerPart = text[integerStart..i];
        var fraction = ReadOnlySpan<byte>.Empty;
        if (i < text.Length && text[i] == (byte)'.')
        {
            i++;
            var fractionStart = i;
            while (i < text.Length && IsDigit(text[i]))
            {
                i++;
            }

            fraction = text[fractionStart..i];
        }

        if (i != text.Length || (integerPart.IsEmpty && fraction.IsEmpty))
        {
            return null;
        }

        return Compose(negative, integerPart, fraction);
    }

    /// <summary>Canonical text of a parsed number (dictionary values arrive as doubles from the parser).</summary>
    public static string FromDouble(double value)
    {
        if (double.IsNaN(value) || double.IsInfinity(value))
        {
            return "0";
        }

        var text = value.ToString("R", CultureInfo.InvariantCulture);
        if (text.Contains('E', StringComparison.Ordinal))
        {
            // Exponent form: spell the value out in plain decimals.
            text = Math.Abs(value) < 7.9e28
                ? ((decimal)value).ToString(CultureInfo.InvariantCulture)
                : value.ToString("F0", CultureInfo.InvariantCulture);
        }

        return FromPdfText(TextEncoding.ASCII.GetBytes(text)) ?? "0";
    }

    private static string Compose(bool negative, ReadOnlySpan<byte> integerPart, ReadOnlySpan<byte> fraction)
    {
        while (integerPart.Length > 1 && integerPart[0] == (byte)'0')
        {
            integerPart = integerPart[1..];
        }

        while (!fraction.IsEmpty && fraction[^1] == (byte)'0')
        {
            fraction = fraction[..^1];
        }

        var builder = new System.Text.StringBuilder(integerPart.Length + fraction.Length + 2);
        var integerText = integerPart.IsEmpty ? "0" : TextEncoding.ASCII.GetString(integerPart);
        var isZero = integerText == "0" && fraction.IsEmpty;
        if (negative && !isZero)
        {
            builder.Append('-');
        }

        builder.Append(integerText);
        if (!fraction.IsEmpty)
        {
            builder.Append('.').Append(TextEncoding.ASCII.GetString(fraction));
        }

        return builder.ToString();
    }

    private static bool IsDigit(byte b) => b is >= (byte)'0' and <= (byte)'9';
}
