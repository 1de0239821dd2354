namespace IndexKeeper.Core.Documents.Pdf.Filters;

/// <summary>Gives back bytes already taken from a source (to sniff a header) before the rest of it.</summary>
internal sealed class PrefixedStream(byte[] prefix, Stream rest) : DecodeStream(rest)
{
    private int prefixPosition;

    protected override bool Produce()
    {
        if (prefixPosition < prefix.Length)
        {
            Emit(prefix.AsSpan(prefixPosition));
            prefixPosition = prefix.Length;
            return true;
        }

        while (Pending < 4096)
        {
            var b = NextByte();
            if (b < 0)
            {
                return false;
            }

            Emit((byte)b);
        }

        return true;
    }
}
