namespace IndexKeeper.Tests.Demo;

/// <summary>The demo store test classes share one generated store.</summary>
[CollectionDefinition(Name)]
public sealed class DemoStoreCollection : ICollectionFixture<DemoStoreFixture>
{
    public const string Name = "demo store";
}
