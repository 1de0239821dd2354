using IndexKeeper.Core.Pipeline;
using IndexKeeper.Core.Scheduling;

namespace IndexKeeper.Service.Planning;

/// <summary>What the caller adds to the index when asking for a plan.</summary>
/// <param name="Now">The instant the plan starts from.</param>
/// <param name="BudgetSpent">Budget grants of the last hour (the daemon's ledger); empty means the budget is full.</param>
/// <param name="Calibrate">Time the encoder on a small sample of real pages when there is no embed history.</param>
public sealed record PlanRequest(DateTimeOffset Now, IReadOnlyList<BudgetSpend> BudgetSpent, bool Calibrate, IProgress<ScanProgress>? Progress = null)
{
    /// <summary>The work queue's workers as the daemon last saw them (docs/work-queue.md); the live ones of the active encoder set the finish time.</summary>
    public IReadOnlyList<WorkQueue.WorkerFigures>? Workers { get; init; }

    /// <summary>When the daemon last tried to retrain the serving view (a try is not repeated within a day); null when never.</summary>
    public DateTimeOffset? RetrainingTriedAt { get; init; }
}
