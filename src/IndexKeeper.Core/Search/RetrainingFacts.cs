namespace IndexKeeper.Core.Search;

/// <summary>What the retraining decision looks at, read from a serving view (<see cref="RetrainingDecision.Of"/>).</summary>
/// <param name="Source">Where the view's candidates come from; only trained centroids age.</param>
/// <param name="Pages">Live pages of the view.</param>
/// <param name="Recall">Its last recall figure; null when never measured.</param>
/// <param name="AddedShare">Share of its vectors added since its centroids were trained; null when unknown (a view read
/// from its file does not record it).</param>
/// <param name="TrainedAt">When its centroids were trained; null when unknown.</param>
/// <param name="LastAttempt">When retraining was last tried in this process; null when never.</param>
public sealed record RetrainingFacts(CandidateSource Source, int Pages, CandidateRecall? Recall, double? AddedShare, DateTimeOffset? TrainedAt, DateTimeOffset? LastAttempt);
