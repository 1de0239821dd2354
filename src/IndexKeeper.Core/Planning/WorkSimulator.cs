using IndexKeeper.Core.Queue;
using IndexKeeper.Core.Scheduling;

namespace IndexKeeper.Core.Planning;

/// <summary>
/// Plays queued work forward through the <see cref="EncoderGate"/> (docs/plan.md, "Finish time"): the
/// same decisions the embed loop takes, at a constant encoder cost per page. Pure: no clock.
/// <list type="bullet">
/// <item>Inside a window pages run back to back in priority order; only pages that finish before the
/// window closes count (no batch starts after it), the rest wait for the next window.</item>
/// <item>Outside windows each budget grant runs at once, is recorded against the budget at its start,
/// and the next is asked for when the previous is done or the gate says to look again.</item>
/// </list>
/// </summary>
public static class WorkSimulator
{
    /// <summary>How far ahead the simulation looks before it calls the work unfinishable.</summary>
    public static TimeSpan DefaultHorizon { get; } = TimeSpan.FromDays(366);

    public static WorkForecast Simulate(
        EncoderGate gate,
        DateTimeOffset start,
        QueuedPages work,
        double encoderSecondsPerPage,
        IReadOnlyList<BudgetSpend> spentBefore,
        TimeSpan horizon)
    {
        ArgumentNullException.ThrowIfNull(gate);
        ArgumentNullException.ThrowIfNull(spentBefore);
        if (double.IsNaN(encoderSecondsPerPage) || encoderSecondsPerPage < 0)
        {
            throw new ArgumentOutOfRangeException(nameof(encoderSecondsPerPage), encoderSecondsPerPage, "Encoder seconds per page must be zero or more.");
        }

        var pageTime = TimeSpan.FromSeconds(encoderSecondsPerPage);
        var spends = spentBefore.ToList();
        var end = start + horizon;
        var t = start;
        var left = work;
        DateTimeOffset? fresh = work.Fresh == 0 ? start : null;
        DateTimeOffset? migration = work.Migration == 0 ? start : null;
        DateTimeOffset? canary = work.Canary == 0 ? start : null;
        while (left.Total > 0 && t < end)
        {
            var decision = gate.Decide(t, left, spends);
            long take;
            if (decision.Mode == GateMode.Window)
            {
                // Whole pages that fit before the window closes.
                var fits = pageTime == TimeSpan.Zero || decision.Until == DateTimeOffset.MaxValue
                    ? long.MaxValue
                    : (long)Math.Floor((decision.Until - t).TotalSeconds / encoderSecondsPerPage);
                take = Math.Min(fits, left.Total);
                if (take == 0)
                {
                    t = decision.Until;
                    continue;
                }
            }
            else if (decision.Mode == GateMode.Budget)
            {
                take = decision.PagesAllowed;
                spends.Add(new BudgetSpend(t, take));
            }
            else
            {
                if (decision.LookAgainAt == DateTimeOffset.MaxValue)
                {
                    break;
                }

                t = decision.LookAgainAt;
                continue;
            }

            // Pages run in priority order; each priority is done when its last page finishes.
            var before = left;
            left = left.Take(take, out _);
            fresh ??= Done(before.Fresh, left.Fresh, t, 0, pageTime);
            migration ??= Done(before.Migration, left.Migration, t, before.Fresh - left.Fresh, pageTime);
            canary ??= Done(before.Canary, left.Canary, t, before.Fresh - left.Fresh + before.Migration - left.Migration, pageTime);
            t += pageTime * take;
            spends.RemoveAll(s => s.At + EncoderGate.BudgetPeriod <= t);
        }

        DateTimeOffset? all = fresh is null || migration is null || canary is null ? null : Max(Max(fresh.Value, migration.Value), canary.Value);
        return new WorkForecast(fresh, migration, canary, all, encoderSecondsPerPage * work.Total);
    }

    /// <summary>The finish of a priority that ran out in this step, after the pages run before it.</summary>
    private static DateTimeOffset? Done(long before, long after, DateTimeOffset stepStart, long pagesAhead, TimeSpan pageTime) =>
        before > 0 && after == 0 ? stepStart + (pageTime * (pagesAhead + before)) : null;

    private static DateTimeOffset Max(DateTimeOffset a, DateTimeOffset b) => a > b ? a : b;
}
