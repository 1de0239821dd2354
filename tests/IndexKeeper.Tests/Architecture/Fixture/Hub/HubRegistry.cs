using IndexKeeper.Tests.Architecture.Fixture.Leaf;

namespace IndexKeeper.Tests.Architecture.Fixture.Hub;

/// <summary>The hub of the <see cref="LayeringTests"/> fixture; its use of the leaf is an allowed edge.</summary>
internal static class HubRegistry
{
    public static int Distinct(IEnumerable<string> names) => names.Distinct(StringComparer.Ordinal).Count();

    public static int Total(IEnumerable<string> names) => LeafTally.Count(names);
}
