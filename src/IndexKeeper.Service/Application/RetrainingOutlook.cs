using IndexKeeper.Core.Planning;
using IndexKeeper.Core.Search;

namespace IndexKeeper.Service.Application;

/// <summary>
/// The serving view's retraining as seen now (docs/search.md, "Retraining"): whether it is due and why, its
/// estimated cost, and the first slot in the windows long enough for it. One answer for the daemon, which runs it
/// at that slot, and for <c>plan</c>, which shows it.
/// </summary>
/// <param name="Facts">The view's figures it was taken on.</param>
/// <param name="Decision">Whether retraining is due, and why.</param>
/// <param name="EstimatedSeconds">CPU seconds the build is expected to take.</param>
/// <param name="StartsAt">When it will run within the windows (now: it is running or has just run); null when not due or no window is long enough.</param>
public sealed record RetrainingOutlook(RetrainingFacts Facts, RetrainingDecision Decision, double EstimatedSeconds, DateTimeOffset? StartsAt)
{
    public static RetrainingOutlook Of(RetrainingFacts facts, IndexSettings settings, ServingViews serving, DateTimeOffset now)
    {
        ArgumentNullException.ThrowIfNull(settings);
        ArgumentNullException.ThrowIfNull(serving);
        var decision = RetrainingDecision.Of(facts, settings.Retraining, now);
        var estimate = serving.EstimatedBuildSeconds(facts.Pages);
        return new(facts, decision, estimate, decision.Due ? RetrainingSlot.Next(settings.Calendar, now, estimate) : null);
    }
}
