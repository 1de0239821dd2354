using IndexKeeper.Core.Planning;
using IndexKeeper.Core.Queue;
using IndexKeeper.Core.Scheduling;

namespace IndexKeeper.Service.Daemon;

/// <summary>
/// The daemon's side of <see cref="EncoderGate"/>: keeps the budget grants of the last period (in memory: a
/// restart forgets them, so at worst one extra hour of budget is spent) and turns decisions into allowances.
/// Used by the work loop's thread only.
/// </summary>
internal sealed class ScheduledEmbedGate(EncoderGate gate) : IEmbedGate
{
    private readonly List<BudgetSpend> spends = [];
    private GateMode lastMode = GateMode.Waiting;

    public EmbedAllowance Allowance(DateTimeOffset now, QueuedPages queued)
    {
        spends.RemoveAll(s => s.At + EncoderGate.BudgetPeriod <= now);
        var decision = gate.Decide(now, queued, spends);
        lastMode = decision.Mode;
        var open = decision.Mode == GateMode.Window;

        // The end of the window we are in, or of the next one: what the backlog has to finish before.
        // A window reaching the horizon has no end worth reporting.
        var horizon = now + TimeSpan.FromDays(8);
        var windowEnd = gate.Calendar.OpenSpans(now, horizon).Select(s => (DateTimeOffset?)s.End).FirstOrDefault();
        windowEnd = windowEnd >= horizon ? null : windowEnd;
        var lowest = decision.Priorities.Count == 0 ? QueuePriority.Fresh : decision.Priorities.Max();
        return new EmbedAllowance(decision.Priorities.Count == 0 ? 0 : decision.PagesAllowed, lowest, open, windowEnd);
    }

    public WorkForecast Forecast(DateTimeOffset now, QueuedPages work, double encoderSecondsPerPage) =>
        WorkSimulator.Simulate(gate, now, work, encoderSecondsPerPage, spends, WorkSimulator.DefaultHorizon);

    public IReadOnlyList<BudgetSpend> Spends => spends.ToList();

    public void Spent(DateTimeOffset now, long pages)
    {
        if (lastMode == GateMode.Budget && pages > 0)
        {
            spends.Add(new BudgetSpend(now, pages));
        }
    }

    public void Refund(DateTimeOffset grantedAt, long pages)
    {
        var at = spends.FindIndex(s => s.At == grantedAt);
        if (at < 0 || pages <= 0)
        {
            // The grant no longer counts (its period is over): nothing to give back.
            return;
        }

        var left = spends[at].Pages - pages;
        if (left > 0)
        {
            spends[at] = spends[at] with { Pages = left };
        }
        else
        {
            spends.RemoveAt(at);
        }
    }
}
