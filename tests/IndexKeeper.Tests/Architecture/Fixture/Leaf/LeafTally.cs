namespace IndexKeeper.Tests.Architecture.Fixture.Leaf;

/// <summary>
/// A deliberate back edge for <see cref="LayeringTests"/>: this leaf reaches its hub only inside a method
/// body (no field, parameter, return or base type names it), so only the IL shows the edge.
/// </summary>
internal static class LeafTally
{
    public static int Count(IEnumerable<string> names) => Hub.HubRegistry.Distinct(names);
}
