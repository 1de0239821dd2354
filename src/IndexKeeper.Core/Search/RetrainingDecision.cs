using System.Globalization;

namespace IndexKeeper.Core.Search;

/// <summary>
/// Whether a serving view's centroids need retraining, and why (docs/search.md, "Retraining"). Pure: the daemon
/// asks it when idle and runs what is due inside a window; <c>plan</c> shows it.
/// </summary>
/// <param name="Due">True when a retraining should run at the next slot in the windows.</param>
/// <param name="Trigger"><c>recall</c> or <c>added-share</c> when due; null otherwise (never renamed: the plan's JSON carries it).</param>
/// <param name="Reason">One sentence for people.</param>
public sealed record RetrainingDecision(bool Due, string? Trigger, string Reason)
{
    public const string RecallTrigger = "recall";
    public const string AddedShareTrigger = "added-share";

    public static RetrainingDecision Of(RetrainingFacts facts, RetrainingPolicy policy, DateTimeOffset now)
    {
        ArgumentNullException.ThrowIfNull(facts);
        ArgumentNullException.ThrowIfNull(policy);
        if (facts.Source != CandidateSource.Centroids)
        {
            return new(false, null, "candidates do not come from trained centroids; nothing ages");
        }

        if (facts.Pages == 0)
        {
            return new(false, null, "the view is empty");
        }

        if (facts.LastAttempt is { } attempt && now - attempt < RetrainingPolicy.RetryAfter)
        {
            return new(false, null, Invariant($"retrained or tried at {attempt:yyyy-MM-dd HH:mm}Z; not again before {attempt + RetrainingPolicy.RetryAfter:yyyy-MM-dd HH:mm}Z"));
        }

        if (facts.Recall is { } recall && recall.Recall < policy.BelowRecall)
        {
            return new(true, RecallTrigger, Invariant($"recall figure {recall.Recall:0.000} is below {policy.BelowRecall:0.000} (Query:RetrainBelowRecall)"));
        }

        if (policy.AfterAddedShare > 0 && facts.AddedShare is { } share && share >= policy.AfterAddedShare)
        {
            return new(true, AddedShareTrigger, Invariant($"{share:P1} of the vectors were added since training, at least {policy.AfterAddedShare:P0} (Query:RetrainAfterAddedShare)"));
        }

        var figure = facts.Recall is { } r ? Invariant($"recall figure {r.Recall:0.000}") : "no recall figure yet";
        var added = facts.AddedShare is { } a ? Invariant($"{a:P1} added since training") : "share added since training unknown";
        return new(false, null, $"{figure}, {added}: within the thresholds");
    }

    private static string Invariant(FormattableString text) => text.ToString(CultureInfo.InvariantCulture);
}
