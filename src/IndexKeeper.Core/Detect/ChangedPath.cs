namespace IndexKeeper.Core.Detect;

/// <summary>A path under a root that a notification named: '/'-separated, relative to the root.</summary>
public sealed record ChangedPath(string Root, string RelativePath);
