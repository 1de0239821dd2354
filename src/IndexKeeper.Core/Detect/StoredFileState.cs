namespace IndexKeeper.Core.Detect;

/// <summary>What the catalog remembers of a file for the quick check.</summary>
/// <param name="Sha256">Content hash taken with <paramref name="Stat"/>; null if never hashed stably.</param>
/// <param name="CheckedAtTicksUtc">When <paramref name="Stat"/> was taken (UTC ticks), from <see cref="FileHashResult.CheckedAtTicksUtc"/>.</param>
public sealed record StoredFileState(FileStat Stat, byte[]? Sha256, long CheckedAtTicksUtc);
