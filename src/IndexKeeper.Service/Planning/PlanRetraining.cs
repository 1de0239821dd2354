namespace IndexKeeper.Service.Planning;

/// <summary>The plan's view of retraining the serving view's centroids (docs/plan.md, docs/search.md "Retraining").</summary>
public sealed record PlanRetraining
{
    /// <summary>True when a retraining will run in the next slot of the windows.</summary>
    public bool Due { get; init; }

    /// <summary><c>recall</c> or <c>added-share</c> when due; null otherwise.</summary>
    public string? Trigger { get; init; }

    /// <summary>Why, in a sentence.</summary>
    public string Reason { get; init; } = string.Empty;

    /// <summary>The last recall figure; null when never measured.</summary>
    public double? Recall { get; init; }

    /// <summary>Share of the view's vectors added since training; null when unknown (only the daemon holding the view knows it).</summary>
    public double? AddedShareSinceTraining { get; init; }

    /// <summary>When the centroids were trained; null when unknown (as above).</summary>
    public DateTimeOffset? TrainedAt { get; init; }

    /// <summary>Live pages the new view would hold.</summary>
    public long Pages { get; init; }

    /// <summary>CPU seconds of the build: pages × the last build's CPU seconds a page (or the benchmark's figure when none ran here).</summary>
    public double EstimatedCpuSeconds { get; init; }

    /// <summary>When it will start: the first instant in a window that stays open for the estimate; null when not due or no window fits within 14 days.</summary>
    public DateTimeOffset? StartsAt { get; init; }
}
