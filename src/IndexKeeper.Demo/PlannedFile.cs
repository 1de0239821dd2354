namespace IndexKeeper.Demo;

/// <summary>A file of the demo store: where it goes (root name, '/'-separated path under the root), how
/// many pages it has, and how to make its bytes.</summary>
internal sealed record PlannedFile(string Root, string RelativePath, int PageCount, Func<byte[]> Build)
{
    public string StorePath => Root + "/" + RelativePath;
}
