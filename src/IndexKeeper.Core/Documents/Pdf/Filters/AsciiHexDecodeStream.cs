namespace IndexKeeper.Core.Documents.Pdf.Filters;

/// <summary>ASCIIHexDecode (ISO 32000-1 §7.4.2): hex digit pairs, white space ignored, '>' ends the data.</summary>
internal sealed class AsciiHexDecodeStream(Stream source) : DecodeStream(source)
{
    private int high = -1;

    protected override bool Produce()
    {
        while (Pending < 4096)
        {
            var b = NextByte();
            if (b < 0 || b == '>')
            {
                // An odd final digit is followed by an implied 0 (§7.4.2).
                if (high >= 0)
                {
                    Emit((byte)(high << 4));
                }

                return false;
            }

            // White space is skipped; so are other non-hex bytes (common practice of tolerant readers).
            var digit = HexValue(b);
            if (digit < 0)
            {
                continue;
            }

            if (high < 0)
            {
                high = digit;
            }
            else
            {
                Emit((byte)((high << 4) | digit));
                high = -1;
            }
        }

        return true;
    }

    private static int HexValue(int b) => b switch
    {
        >= '0' and <= '9' => b - '0',
        >= 'a' and <= 'f' => b - 'a' + 10,
        >= 'A' and <= 'F' => b - 'A' + 10,
        _ => -1,
    };
}
