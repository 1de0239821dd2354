using IndexKeeper.Core.Drift;
using IndexKeeper.Core.Pipeline;

namespace IndexKeeper.Service.Application;

/// <summary>
/// Silent drift (docs/encoders.md, "Canaries"): re-embeds the canary pages with the active encoder and
/// records the figures; the daemon checks every <c>Drift:CanaryIntervalHours</c>, <c>encoders --check-canaries</c> now.
/// </summary>
public sealed class CanaryOperation(OpenIndex index, IndexSettings settings)
{
    /// <summary>Whether the active encoder's canaries are due for a check; never when <c>Drift:CanaryPages</c> is 0.</summary>
    public bool Due(DateTime nowUtc) =>
        settings.Canaries.Pages > 0 &&
        CanarySchedule.IsDue(index.Catalog.Encoders.Find(index.Encoder.Identity.Id)?.CanaryCheckedUtc?.ToUniversalTime(), settings.CanaryInterval, nowUtc);

    /// <remarks>REQUIRES: the index is open for writing and nothing else writes it.</remarks>
    public CanaryFigures Check(CancellationToken cancellationToken) =>
        CanaryCheck.Run(index.Catalog, index.Store, index.Words, index.Encoder, settings.RootPaths, settings.Canaries, DateTime.UtcNow, cancellationToken);
}
