namespace IndexKeeper.Core.Documents;

/// <summary>Bounds that keep one hostile or huge document from taking the reader down.</summary>
/// <param name="MaxFileBytes">Files larger than this are quarantined unread.</param>
/// <param name="MaxPages">Documents with more pages are quarantined.</param>
/// <param name="MaxDecodedBytesPerStream">Cap on the decoded size of any one stream (content, image, font).</param>
/// <param name="ReadTimeout">Watchdog per document; a read that takes longer is abandoned and quarantined.</param>
public sealed record ReadLimits(long MaxFileBytes, int MaxPages, long MaxDecodedBytesPerStream, TimeSpan ReadTimeout)
{
    public static ReadLimits Default { get; } = new(
        MaxFileBytes: 512L * 1024 * 1024,
        MaxPages: 5000,
        MaxDecodedBytesPerStream: 256L * 1024 * 1024,
        ReadTimeout: TimeSpan.FromSeconds(60));
}
