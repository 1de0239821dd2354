using IndexKeeper.Core.Queue;

namespace IndexKeeper.Core.Scheduling;

/// <summary>
/// Decides when queued work may use the encoder (docs/scheduling.md). Pure: the caller passes the
/// instant, what is queued, and the budget grants of the last period. Rules:
/// <list type="number">
/// <item>Inside a window every priority runs at full speed; the grant ends when the window closes.</item>
/// <item>Outside windows only fresh pages run, at most the budget per rolling hour; grants made inside
/// windows do not count against the budget.</item>
/// <item>When nothing may run, look again at the next window change or when the oldest budget grant
/// ages out, whichever comes first and matters.</item>
/// </list>
/// </summary>
public sealed class EncoderGate
{
    private static readonly IReadOnlyList<QueuePriority> All = [QueuePriority.Fresh, QueuePriority.Migration, QueuePriority.Canary];

    private static readonly IReadOnlyList<QueuePriority> FreshOnly = [QueuePriority.Fresh];

    public EncoderGate(WindowCalendar calendar, long budgetPagesPerHour)
    {
        ArgumentNullException.ThrowIfNull(calendar);
        ArgumentOutOfRangeException.ThrowIfNegative(budgetPagesPerHour);
        Calendar = calendar;
        BudgetPagesPerHour = budgetPagesPerHour;
    }

    /// <summary>The rolling period over which the budget is counted.</summary>
    public static TimeSpan BudgetPeriod { get; } = TimeSpan.FromHours(1);

    public WindowCalendar Calendar { get; }

    public long BudgetPagesPerHour { get; }

    /// <summary>Pages of budget still unspent at <paramref name="now"/>.</summary>
    public long BudgetLeft(DateTimeOffset now, IReadOnlyList<BudgetSpend> spends)
    {
        ArgumentNullException.ThrowIfNull(spends);
        var spent = spends.Where(s => Counts(s, now)).Sum(s => s.Pages);
        return Math.Max(0, BudgetPagesPerHour - spent);
    }

    public GateDecision Decide(DateTimeOffset now, QueuedPages queued, IReadOnlyList<BudgetSpend> spends)
    {
        ArgumentNullException.ThrowIfNull(spends);
        var change = Calendar.NextChange(now);
        if (Calendar.IsOpen(now))
        {
            return new GateDecision(GateMode.Window, All, queued.Total, change, queued.Total > 0 ? now : change);
        }

        var left = BudgetLeft(now, spends);
        if (queued.Fresh > 0 && left > 0)
        {
            return new GateDecision(GateMode.Budget, FreshOnly, Math.Min(queued.Fresh, left), change, now);
        }

        var lookAgain = change;
        if (queued.Fresh > 0 && BudgetPagesPerHour > 0)
        {
            var frees = BudgetFreesAt(now, spends);
            lookAgain = frees < lookAgain ? frees : lookAgain;
        }

        return new GateDecision(GateMode.Waiting, [], 0, change, lookAgain);
    }

    /// <summary>A grant counts from its instant until one period later (and a grant dated ahead of now counts too).</summary>
    private static bool Counts(BudgetSpend spend, DateTimeOffset now) => now < spend.At + BudgetPeriod;

    /// <summary>The first instant at which at least one page of budget is free again.</summary>
    private DateTimeOffset BudgetFreesAt(DateTimeOffset now, IReadOnlyList<BudgetSpend> spends)
    {
        var counting = spends.Where(s => Counts(s, now)).OrderBy(s => s.At).ToList();
        var spent = counting.Sum(s => s.Pages);
        foreach (var spend in counting)
        {
            spent -= spend.Pages;
            if (spent < BudgetPagesPerHour)
            {
                return spend.At + BudgetPeriod;
            }
        }

        return now;
    }
}
