namespace IndexKeeper.Core.Detect;

/// <summary>A regular file found under a root by a walk, with its quick-check stat.</summary>
/// <param name="RelativePath">Path under the root with '/' separators, as found (the catalog's name for it).</param>
public sealed record FoundFile(string Root, string RelativePath, string FullPath, FileStat Stat);
