using IndexKeeper.Core.Drift;
using IndexKeeper.Core.Pipeline;

namespace IndexKeeper.Service.Application;

/// <summary>
/// Silent drift (docs/encoders.md, "Canaries"): re-embeds the canary pages with the active encoder and
/// records the figures; the daemon checks every <c>Drift:CanaryIntervalHours</c>, <c>encoders --check-canaries</c> now.
/// </summary>
public sealed class CanaryOperation(OpenIndex index, IndexSettings settings)
{
    // The active encoder's last check as read at a catalog commit count: the daemon asks at every idle turn (with a work
    // queue, at every hand-back), and a catalog read each time was 4 % of a busy coordinator (docs/benchmarks.md,
    // workqueue run 11). Read again after any commit, another encoder, or a check.
    private (string EncoderId, long Commits, DateTime? CheckedUtc)? known;

    /// <summary>Whether the active encoder's canaries are due for a check; never when <c>Drift:CanaryPages</c> is 0.</summary>
    public bool Due(DateTime nowUtc)
    {
        if (settings.Canaries.Pages <= 0)
        {
            return false;
        }

        var (encoderId, commits) = (index.Encoder.Identity.Id, index.Catalog.Commits);
        if (known is not { } last || last.EncoderId != encoderId || last.Commits != commits)
        {
            known = last = (encoderId, commits, index.Catalog.Encoders.Find(encoderId)?.CanaryCheckedUtc?.ToUniversalTime());
        }

        return CanarySchedule.IsDue(last.CheckedUtc, settings.CanaryInterval, nowUtc);
    }

    /// <remarks>REQUIRES: the index is open for writing and nothing else writes it.</remarks>
    public CanaryFigures Check(CancellationToken cancellationToken)
    {
        known = null;
        return CanaryCheck.Run(index.Catalog, index.Store, index.Words, index.Encoder, settings.RootPaths, settings.Canaries, DateTime.UtcNow, cancellationToken);
    }
}
