using System.Security.Cryptography;
using System.Text;

namespace IndexKeeper.Demo;

/// <summary>
/// Replaces the random file identifier the PDF builder writes into the trailer with a deterministic one
/// (ISO 32000-1 §14.4): the first string is permanent (from the document's identity), the second follows
/// the file's contents. Same length hex, so no offset in the file moves.
/// </summary>
internal static class PdfTrailerId
{
    private const int HexDigits = 32;

    public static byte[] MakeDeterministic(byte[] pdf, string documentIdentity)
    {
        int first = FindIdStrings(pdf);
        int second = first + HexDigits + 2;
        WriteHex(pdf, first, new byte[HexDigits / 2]);
        WriteHex(pdf, second, new byte[HexDigits / 2]);
        byte[] permanent = SHA256.HashData(Encoding.UTF8.GetBytes(documentIdentity));
        byte[] changing = SHA256.HashData(pdf);
        WriteHex(pdf, first, permanent.AsSpan(0, HexDigits / 2));
        WriteHex(pdf, second, changing.AsSpan(0, HexDigits / 2));
        return pdf;
    }

    /// <summary>Offset of the first hex digit of the trailer's "/ID [ &lt;…&gt;&lt;…&gt;]".</summary>
    private static int FindIdStrings(byte[] pdf)
    {
        ReadOnlySpan<byte> marker = "/ID ["u8;
        int at = pdf.AsSpan().LastIndexOf(marker);
        if (at < 0)
        {
            throw new InvalidOperationException("the PDF builder wrote no file identifier");
        }

        int position = at + marker.Length;
        while (pdf[position] == (byte)' ')
        {
            position++;
        }

        bool wellFormed = pdf[position] == (byte)'<'
            && pdf[position + HexDigits + 1] == (byte)'>'
            && pdf[position + HexDigits + 2] == (byte)'<'
            && pdf[position + 2 * HexDigits + 3] == (byte)'>';
        if (!wellFormed)
        {
            throw new InvalidOperationException("the PDF builder wrote a file identifier of an unexpected form");
        }

        return position + 1;
    }

    private static void WriteHex(byte[] pdf, int offset, ReadOnlySpan<byte> value)
    {
        string hex = Convert.ToHexString(value);
        Encoding.ASCII.GetBytes(hex, pdf.AsSpan(offset, hex.Length));
    }
}
