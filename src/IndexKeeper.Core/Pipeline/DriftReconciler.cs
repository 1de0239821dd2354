using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Drift;
using IndexKeeper.Core.Encoding;

namespace IndexKeeper.Core.Pipeline;

/// <summary>
/// Joins <see cref="DriftPolicy"/> to the catalog: records the active encoder, reads the facts, applies the
/// decision in one transaction. Run after a scan (queues drifted pages) and after embedding (switches over
/// once the migration is complete); the daemon does the same around each embed batch.
/// </summary>
/// <remarks>REQUIRES: the index lock is held; the only writer of the catalog.</remarks>
public static class DriftReconciler
{
    public static DriftDecision Reconcile(IndexCatalog catalog, EncoderIdentity active, IReadOnlyDictionary<string, string> settings, DateTime nowUtc)
    {
        ArgumentNullException.ThrowIfNull(catalog);
        ArgumentNullException.ThrowIfNull(active);
        catalog.Encoders.Register(active, settings);
        var decision = DriftPolicy.Decide(catalog.ReadDriftFacts(active.Id));
        catalog.ApplyDrift(decision, nowUtc);
        return decision;
    }

    /// <summary>The same decision without writing anything (for <c>status</c> and <c>encoders</c>).</summary>
    public static DriftDecision Read(IndexCatalog catalog, string activeEncoderId)
    {
        ArgumentNullException.ThrowIfNull(catalog);
        return DriftPolicy.Decide(catalog.ReadDriftFacts(activeEncoderId));
    }
}
