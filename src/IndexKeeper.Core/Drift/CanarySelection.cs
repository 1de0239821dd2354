namespace IndexKeeper.Core.Drift;

/// <summary>Chooses canary pages: the <c>count</c> lowest page keys (ordinal) — deterministic, stable while those pages live, and spread evenly because keys are hashes.</summary>
public static class CanarySelection
{
    public static IReadOnlyList<string> Choose(IEnumerable<string> pageKeys, int count)
    {
        ArgumentNullException.ThrowIfNull(pageKeys);
        ArgumentOutOfRangeException.ThrowIfNegative(count);
        return pageKeys.Distinct(StringComparer.Ordinal).Order(StringComparer.Ordinal).Take(count).ToList();
    }
}
