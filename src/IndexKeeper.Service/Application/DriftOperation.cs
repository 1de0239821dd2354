using IndexKeeper.Core.Drift;
using IndexKeeper.Core.Pipeline;

namespace IndexKeeper.Service.Application;

/// <summary>
/// Declared drift (docs/encoders.md): records the active encoder, queues pages whose vectors are only under
/// the serving encoder, and switches over when none are left. The policy is Core's; this applies it to the open index.
/// </summary>
public sealed class DriftOperation(OpenIndex index, IndexSettings settings)
{
    /// <summary>Records the active encoder and applies declared drift: queues drifted pages, switches over when complete.</summary>
    public DriftDecision Reconcile() =>
        DriftReconciler.Reconcile(index.Catalog, index.Encoder.Identity, settings.EncoderRecord, DateTime.UtcNow);

    /// <summary>The drift state as <see cref="Reconcile"/> would see it, without writing.</summary>
    public DriftDecision Read() => DriftReconciler.Read(index.Catalog, index.Encoder.Identity.Id);
}
