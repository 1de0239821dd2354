namespace IndexKeeper.Demo;

/// <summary>A document of the demo store: the root it is under, its '/'-separated path under that root,
/// and its number of pages as generated (a PNG or JPEG is one page, a TIFF one page per image).</summary>
public sealed record DemoDocument(string Root, string RelativePath, int PageCount);
