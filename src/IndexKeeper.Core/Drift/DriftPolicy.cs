namespace IndexKeeper.Core.Drift;

/// <summary>
/// Declared drift (docs/encoders.md, "Drift and migration"): the pure decision of which pages are drifted,
/// when a migration is complete, and which encoders' vectors are no longer needed. Plain data in, plain
/// data out; the catalog applies the result in one transaction.
/// </summary>
public static class DriftPolicy
{
    public static DriftDecision Decide(DriftFacts facts)
    {
        ArgumentNullException.ThrowIfNull(facts);
        var active = facts.ActiveEncoderId;
        var serving = facts.ServingEncoderId ?? Infer(facts);
        var servingPages = PagesOf(facts, serving);
        var activePages = PagesOf(facts, active);
        var drifted = new List<string>();
        long migrated = 0;
        var switchOver = false;
        if (serving != active)
        {
            foreach (var key in servingPages)
            {
                if (activePages.Contains(key))
                {
                    migrated++;
                }
                else
                {
                    drifted.Add(key);
                }
            }

            // Complete: every page the old encoder served has active vectors (fresh pages never block it).
            switchOver = drifted.Count == 0;
        }

        drifted.Sort(StringComparer.Ordinal);
        var newServing = switchOver ? active : serving;
        var retire = facts.LivePagesByEncoder.Keys
            .Where(id => id != newServing && id != active && !facts.RetiredEncoders.Contains(id))
            .Order(StringComparer.Ordinal)
            .ToList();
        return new DriftDecision(
            newServing,
            RecordServing: facts.ServingEncoderId != newServing,
            SwitchOver: switchOver,
            DriftedPages: drifted,
            QueueForMigration: drifted.Where(k => !facts.Queued.Contains(k)).ToList(),
            MigratedPages: migrated,
            RetireEncoders: retire);
    }

    /// <summary>
    /// A catalog that never recorded a serving encoder (made before drift tracking, or new): the active
    /// encoder if it has vectors or nobody has; otherwise the encoder with the most live pages (ties: lowest id).
    /// </summary>
    private static string Infer(DriftFacts facts)
    {
        var withPages = facts.LivePagesByEncoder
            .Where(e => e.Value.Count > 0 && !facts.RetiredEncoders.Contains(e.Key))
            .ToList();
        if (withPages.Count == 0 || withPages.Any(e => e.Key == facts.ActiveEncoderId))
        {
            return facts.ActiveEncoderId;
        }

        return withPages.OrderByDescending(e => e.Value.Count).ThenBy(e => e.Key, StringComparer.Ordinal).First().Key;
    }

    private static IReadOnlySet<string> PagesOf(DriftFacts facts, string encoderId) =>
        facts.LivePagesByEncoder.TryGetValue(encoderId, out var pages) ? pages : new HashSet<string>();
}
