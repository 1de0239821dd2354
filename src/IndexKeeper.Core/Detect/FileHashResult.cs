namespace IndexKeeper.Core.Detect;

/// <summary>The outcome of hashing one file.</summary>
/// <param name="Sha256">The 32-byte SHA-256 of the content; null unless <see cref="Stable"/>.</param>
/// <param name="Before">The stat the read was checked against (the walker's, or taken just before opening).</param>
/// <param name="After">The stat of the path after the read; store this one with the digest.</param>
/// <param name="CheckedAtTicksUtc">When <paramref name="After"/> was taken (UTC ticks); the quick check needs it to spot racy stats.</param>
/// <param name="Detail">Why the result is not stable; null when it is.</param>
public sealed record FileHashResult(
    FileHashStatus Status,
    byte[]? Sha256,
    FileStat Before,
    FileStat After,
    long CheckedAtTicksUtc,
    string? Detail)
{
    public bool Stable => Status == FileHashStatus.Stable;
}
