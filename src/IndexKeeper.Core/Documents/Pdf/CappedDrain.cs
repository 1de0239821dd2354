using System.Buffers;
using System.Security.Cryptography;

namespace IndexKeeper.Core.Documents.Pdf;

/// <summary>
/// Pulls a decoding stream to its end in small chunks, counting bytes against the per-stream cap
/// (ReadLimits.MaxDecodedBytesPerStream) so a small file that inflates to gigabytes is stopped early
/// without ever holding its output. Damaged compressed data ends the stream where it breaks.
/// </summary>
internal static class CappedDrain
{
    private const int ChunkBytes = 64 * 1024;

    /// <param name="decoded">The decoding stream; disposed here.</param>
    /// <param name="cap">Most decoded bytes allowed.</param>
    /// <param name="hash">Receives every decoded byte, if given.</param>
    /// <param name="copy">Receives a copy of every decoded byte, if given (content streams only).</param>
    /// <param name="what">Names the stream in the quarantine message.</param>
    /// <returns>The decoded length and whether the data broke off before its end.</returns>
    public static (long Length, bool Damaged) Run(
        Stream decoded, long cap, IncrementalHash? hash, ArrayBufferWriter<byte>? copy, string what, CancellationToken cancellationToken)
    {
        var chunk = ArrayPool<byte>.Shared.Rent(ChunkBytes);
        long total = 0;
        try
        {
            using (decoded)
            {
                while (true)
                {
                    cancellationToken.ThrowIfCancellationRequested();
                    int n;
                    try
                    {
                        n = decoded.Read(chunk, 0, ChunkBytes);
                    }
                    catch (InvalidDataException)
                    {
                        // Broken deflate data: keep what decoded, as viewers show what they can.
                        return (total, true);
                    }

                    if (n == 0)
                    {
                        return (total, false);
                    }

                    total += n;
                    if (total > cap)
                    {
                        throw new DocumentReadException(
                            QuarantineReason.DecodedStreamTooLarge,
                            $"{what} decodes to more than {cap} bytes (the limit per stream)");
                    }

                    hash?.AppendData(chunk, 0, n);
                    copy?.Write(chunk.AsSpan(0, n));
                }
            }
        }
        finally
        {
            ArrayPool<byte>.Shared.Return(chunk);
        }
    }
}
