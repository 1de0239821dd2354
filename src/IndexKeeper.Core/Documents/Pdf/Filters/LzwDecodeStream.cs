namespace IndexKeeper.Core.Documents.Pdf.Filters;

/// <summary>
/// LZWDecode (ISO 32000-1 §7.4.4): variable-width codes of 9 to 12 bits, high bit first; 256 clears the
/// table, 257 ends the data. With EarlyChange 1 (the default) the code width grows one code early.
/// </summary>
internal sealed class LzwDecodeStream : DecodeStream
{
    private const int ClearTable = 256;
    private const int EndOfData = 257;
    private const int MaxCodes = 4096;

    private readonly int earlyChange;
    private readonly int[] prefix = new int[MaxCodes];
    private readonly byte[] suffix = new byte[MaxCodes];
    private readonly byte[] first = new byte[MaxCodes];
    private readonly int[] lengths = new int[MaxCodes];
    private readonly byte[] scratch = new byte[MaxCodes];
    private int nextCode = 258;
    private int codeWidth = 9;
    private int previous = -1;
    private int bitBuffer;
    private int bitCount;

    public LzwDecodeStream(Stream source, int earlyChange)
        : base(source)
    {
        this.earlyChange = earlyChange == 0 ? 0 : 1;
        for (var i = 0; i < 256; i++)
        {
            suffix[i] = (byte)i;
            first[i] = (byte)i;
            lengths[i] = 1;
            prefix[i] = -1;
        }
    }

    protected override bool Produce()
    {
        while (Pending < 4096)
        {
            var code = ReadCode();
            if (code < 0 || code == EndOfData)
            {
                return false;
            }

            if (code == ClearTable)
            {
                nextCode = 258;
                codeWidth = 9;
                previous = -1;
                continue;
            }

            if (previous < 0)
            {
                if (code > 255)
                {
                    return false; // a first code must be a literal; the data is damaged
                }

                Emit((byte)code);
                previous = code;
                continue;
            }

            byte firstByte;
            if (code < nextCode)
            {
                firstByte = first[code];
                EmitString(code);
            }
            else if (code == nextCode)
            {
                // The KwKwK case: the new string is the previous one plus its own first byte.
                firstByte = first[previous];
                EmitString(previous);
                Emit(firstByte);
            }
            else
            {
                return false;
            }

            if (nextCode < MaxCodes)
            {
                prefix[nextCode] = previous;
                suffix[nextCode] = firstByte;
                first[nextCode] = first[previous];
                lengths[nextCode] = lengths[previous] + 1;
                nextCode++;
            }

            if (nextCode + earlyChange >= (1 << codeWidth) && codeWidth < 12)
            {
                codeWidth++;
            }

            previous = code;
        }

        return true;
    }

    private void EmitString(int code)
    {
        var length = lengths[code];
        for (var i = length - 1; i >= 0; i--)
        {
            scratch[i] = suffix[code];
            code = prefix[code];
        }

        Emit(scratch.AsSpan(0, length));
    }

    private int ReadCode()
    {
        while (bitCount < codeWidth)
        {
            var b = NextByte();
            if (b < 0)
            {
                return -1;
            }

            bitBuffer = (bitBuffer << 8) | b;
            bitCount += 8;
        }

        var code = (bitBuffer >> (bitCount - codeWidth)) & ((1 << codeWidth) - 1);
        bitCount -= codeWidth;
        bitBuffer &= (1 << bitCount) - 1;
        return code;
    }
}
