using IndexKeeper.Core.Planning;
using IndexKeeper.Core.Queue;
using IndexKeeper.Core.Scheduling;

namespace IndexKeeper.Service.Daemon;

/// <summary>Decides how much queued work the encoder may take now (windows and the daytime budget).</summary>
internal interface IEmbedGate
{
    EmbedAllowance Allowance(DateTimeOffset now, QueuedPages queued);

    /// <summary>Tells the gate how many pages were just embedded under its last allowance (the budget spends them).</summary>
    void Spent(DateTimeOffset now, long pages);

    /// <summary>Gives back <paramref name="pages"/> of the budget grant made at <paramref name="grantedAt"/> (published, then back without vectors).</summary>
    void Refund(DateTimeOffset grantedAt, long pages);

    /// <summary>When <paramref name="work"/> would be done through this gate from <paramref name="now"/> at a constant cost per page.</summary>
    WorkForecast Forecast(DateTimeOffset now, QueuedPages work, double encoderSecondsPerPage);

    /// <summary>Budget grants still counting (for the plan's simulation).</summary>
    IReadOnlyList<BudgetSpend> Spends { get; }
}
