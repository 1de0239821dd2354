namespace IndexKeeper.Demo;

/// <summary>What <see cref="DemoStore.Generate"/> wrote.</summary>
public sealed record DemoStoreInfo(IReadOnlyList<DemoRoot> Roots, IReadOnlyList<DemoDocument> Documents)
{
    public int DocumentCount => Documents.Count;

    public int PageCount => Documents.Sum(document => document.PageCount);
}
