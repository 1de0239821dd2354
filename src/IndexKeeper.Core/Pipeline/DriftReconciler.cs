using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Drift;
using IndexKeeper.Core.Encoding;

namespace IndexKeeper.Core.Pipeline;

/// <summary>
/// Joins <see cref="DriftPolicy"/> to the catalog: records the active encoder, reads the facts, applies the
/// decision in one transaction (<see cref="IndexCatalog.ApplyDrift"/>). Run after a scan (queues drifted
/// pages) and after embedding (switches over once the migration is complete); the daemon does the same
/// around each embed batch.
/// </summary>
/// <remarks>REQUIRES: the index lock is held; the only writer of the catalog.</remarks>
public static class DriftReconciler
{
    public static DriftDecision Reconcile(IndexCatalog catalog, EncoderIdentity active, IReadOnlyDictionary<string, string> settings, DateTime nowUtc)
    {
        ArgumentNullException.ThrowIfNull(catalog);
        ArgumentNullException.ThrowIfNull(active);
        catalog.Encoders.Register(active, settings);
        var decision = DriftPolicy.Decide(Facts(catalog, active.Id));
        catalog.ApplyDrift(decision.QueueForMigration, decision.RetireEncoders, decision.RecordServing ? decision.ServingEncoderId : null, nowUtc);
        return decision;
    }

    /// <summary>The same decision without writing anything (for <c>status</c> and <c>encoders</c>).</summary>
    public static DriftDecision Read(IndexCatalog catalog, string activeEncoderId)
    {
        ArgumentNullException.ThrowIfNull(catalog);
        return DriftPolicy.Decide(Facts(catalog, activeEncoderId));
    }

    /// <summary>What <see cref="DriftPolicy"/> needs, read from the catalog.</summary>
    private static DriftFacts Facts(IndexCatalog catalog, string activeEncoderId)
    {
        var known = catalog.Encoders.All();
        var pagesByEncoder = new Dictionary<string, IReadOnlySet<string>>(StringComparer.Ordinal);
        // Every encoder that wrote a vector set is registered by the store's append (VectorStore), so the
        // encoder records name them all without a pass over every vector set (status asks this on each call).
        foreach (var id in known.Select(e => e.Id))
        {
            pagesByEncoder[id] = catalog.VectorSets.LivePageKeysOf(id);
        }

        return new DriftFacts(
            activeEncoderId,
            catalog.Encoders.ServingId(),
            pagesByEncoder,
            catalog.Queue.Keys().Select(q => q.PageKey).ToHashSet(StringComparer.Ordinal),
            known.Where(e => e.Retired).Select(e => e.Id).ToHashSet(StringComparer.Ordinal));
    }
}
