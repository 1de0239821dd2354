namespace IndexKeeper.Core.Documents.Pdf.Filters;

/// <summary>
/// RunLengthDecode (ISO 32000-1 §7.4.5): a length byte 0..127 copies the next n+1 bytes, 129..255
/// repeats the next byte 257-n times, 128 ends the data.
/// </summary>
internal sealed class RunLengthDecodeStream(Stream source) : DecodeStream(source)
{
    protected override bool Produce()
    {
        while (Pending < 4096)
        {
            var length = NextByte();
            if (length < 0 || length == 128)
            {
                return false;
            }

            if (length < 128)
            {
                for (var i = 0; i <= length; i++)
                {
                    var b = NextByte();
                    if (b < 0)
                    {
                        return false;
                    }

                    Emit((byte)b);
                }
            }
            else
            {
                var b = NextByte();
                if (b < 0)
                {
                    return false;
                }

                for (var i = 0; i < 257 - length; i++)
                {
                    Emit((byte)b);
                }
            }
        }

        return true;
    }
}
