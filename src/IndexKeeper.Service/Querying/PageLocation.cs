namespace IndexKeeper.Service.Querying;

/// <summary>A page position in a live document: root, path under the root, 1-based page number.</summary>
public sealed record PageLocation(string Root, string Path, int Page);
