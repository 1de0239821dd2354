namespace IndexKeeper.Core.Detect;

/// <summary>The quick-check triple: if all three are unchanged the file is not hashed again.</summary>
/// <param name="ModifiedTicksUtc">Last write time in UTC ticks (100 ns), as precise as the file system keeps it.</param>
public readonly record struct FileStat(long Size, long ModifiedTicksUtc, FileIdentity Identity);
