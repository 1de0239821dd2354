namespace IndexKeeper.Core.Documents.Pdf.Filters;

/// <summary>
/// ASCII85Decode (ISO 32000-1 §7.4.3): five characters '!'..'u' encode four bytes, 'z' stands for four
/// zero bytes, "~>" ends the data, and a final group of n characters encodes n-1 bytes.
/// </summary>
internal sealed class Ascii85DecodeStream(Stream source) : DecodeStream(source)
{
    private static readonly byte[] FourZeros = new byte[4];

    private readonly int[] group = new int[5];
    private int count;

    protected override bool Produce()
    {
        while (Pending < 4096)
        {
            var b = NextByte();
            if (b < 0 || b == '~')
            {
                Flush(final: true);
                return false;
            }

            if (b == 'z' && count == 0)
            {
                Emit(FourZeros);
                continue;
            }

            if (b < '!' || b > 'u')
            {
                // White space and stray bytes carry no data.
                continue;
            }

            group[count++] = b - '!';
            if (count == 5)
            {
                Flush(final: false);
            }
        }

        return true;
    }

    private void Flush(bool final)
    {
        if (count == 0)
        {
            return;
        }

        var produced = count - 1;
        if (final)
        {
            if (count == 1)
            {
                // One lone character encodes nothing (a malformed tail): drop it.
                count = 0;
                return;
            }

            for (var i = count; i < 5; i++)
            {
                group[i] = 84; // pad with 'u' as §7.4.3 prescribes
            }
        }
        else
        {
            produced = 4;
        }

        ulong value = 0;
        for (var i = 0; i < 5; i++)
        {
            value = (value * 85) + (ulong)group[i];
        }

        Span<byte> bytes = stackalloc byte[4];
        bytes[0] = (byte)(value >> 24);
        bytes[1] = (byte)(value >> 16);
        bytes[2] = (byte)(value >> 8);
        bytes[3] = (byte)value;
        Emit(bytes[..produced]);
        count = 0;
    }
}
