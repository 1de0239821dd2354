namespace IndexKeeper.Core.Search;

/// <summary>
/// When a centroid view's centroids are retrained (docs/search.md, "Retraining"): thresholds from
/// <c>Query:RetrainBelowRecall</c> and <c>Query:RetrainAfterAddedShare</c>, checked at start.
/// </summary>
/// <param name="BelowRecall">Retrain when the last recall figure is below this (0 to 1; 0: never for the figure).</param>
/// <param name="AfterAddedShare">Retrain when at least this share of the view's vectors came after training (0: never for the share).</param>
public sealed record RetrainingPolicy(double BelowRecall, double AfterAddedShare)
{
    /// <summary>An attempt, swapped in or not, is not repeated sooner: a new view that was no better needs more churn to differ.</summary>
    public static readonly TimeSpan RetryAfter = TimeSpan.FromHours(24);

    /// <summary>The defaults: the health limit of the figure (<c>candidate-recall-low</c>), and half the vectors new.</summary>
    public static RetrainingPolicy Default { get; } = new(0.95, 0.5);
}
