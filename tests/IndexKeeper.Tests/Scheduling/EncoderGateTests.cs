using IndexKeeper.Core.Queue;
using IndexKeeper.Core.Scheduling;

namespace IndexKeeper.Tests.Scheduling;

/// <summary>The gate's rules (docs/scheduling.md) over every combination of a constructed set of inputs.</summary>
public sealed class EncoderGateTests
{
    // Window Mon-Fri 19:00-07:00 UTC. 2026-12-07 is a Monday (ISO 8601 calendar).
    private static readonly WindowCalendar Nights = WindowCalendar.Parse(["Mon-Fri 19:00-07:00"], TimeZoneInfo.Utc);

    private static readonly DateTimeOffset InsideWindow = new(2026, 12, 7, 22, 0, 0, TimeSpan.Zero);

    private static readonly DateTimeOffset OutsideWindow = new(2026, 12, 8, 10, 0, 0, TimeSpan.Zero);

    [Fact]
    public void Every_combination_keeps_the_rules()
    {
        long[] freshCounts = [0, 1, 5, 40];
        long[] migrationCounts = [0, 3];
        long[] canaryCounts = [0, 2];
        long[] budgets = [0, 4, 10];
        var checkedCases = 0;
        foreach (var now in new[] { InsideWindow, OutsideWindow })
        {
            BudgetSpend[][] spendSets =
            [
                [],
                [new(now.AddMinutes(-30), 4)],
                [new(now.AddMinutes(-59), 2), new(now.AddMinutes(-10), 2)],
                [new(now.AddMinutes(-61), 100)],                       // aged out: counts no more
                [new(now.AddMinutes(-50), 6), new(now.AddMinutes(-20), 6)],
                [new(now.AddMinutes(-60), 7), new(now.AddMinutes(-5), 1)], // exactly one period old: aged out
            ];
            foreach (var budget in budgets)
            {
                var gate = new EncoderGate(Nights, budget);
                foreach (var spends in spendSets)
                {
                    foreach (var fresh in freshCounts)
                    {
                        foreach (var migration in migrationCounts)
                        {
                            foreach (var canary in canaryCounts)
                            {
                                CheckRules(gate, now, new QueuedPages(fresh, migration, canary), spends);
                                checkedCases++;
                            }
                        }
                    }
                }
            }
        }

        Assert.Equal(2 * 3 * 6 * 4 * 2 * 2, checkedCases);
    }

    private static void CheckRules(EncoderGate gate, DateTimeOffset now, QueuedPages queued, IReadOnlyList<BudgetSpend> spends)
    {
        var decision = gate.Decide(now, queued, spends);
        var change = Nights.NextChange(now);
        Assert.Equal(change, decision.Until);
        var spent = spends.Where(s => s.At > now - TimeSpan.FromHours(1)).Sum(s => s.Pages);
        var left = Math.Max(0, gate.BudgetPagesPerHour - spent);
        Assert.Equal(left, gate.BudgetLeft(now, spends));
        if (Nights.IsOpen(now))
        {
            // Inside a window: everything, every priority in order, until the window closes.
            Assert.Equal(GateMode.Window, decision.Mode);
            Assert.Equal([QueuePriority.Fresh, QueuePriority.Migration, QueuePriority.Canary], decision.Priorities);
            Assert.Equal(queued.Total, decision.PagesAllowed);
            Assert.Equal(queued.Total > 0 ? now : change, decision.LookAgainAt);
            return;
        }

        if (queued.Fresh > 0 && left > 0)
        {
            // Outside: fresh pages only, never past the budget.
            Assert.Equal(GateMode.Budget, decision.Mode);
            Assert.Equal([QueuePriority.Fresh], decision.Priorities);
            Assert.Equal(Math.Min(queued.Fresh, left), decision.PagesAllowed);
            Assert.Equal(now, decision.LookAgainAt);
            return;
        }

        Assert.Equal(GateMode.Waiting, decision.Mode);
        Assert.Empty(decision.Priorities);
        Assert.Equal(0, decision.PagesAllowed);
        Assert.True(decision.LookAgainAt > now);
        Assert.True(decision.LookAgainAt <= change);
        if (queued.Fresh > 0 && gate.BudgetPagesPerHour > 0 && decision.LookAgainAt < change)
        {
            // The earliest instant at which budget frees: some at it, none a second before.
            Assert.True(gate.BudgetLeft(decision.LookAgainAt, spends) > 0);
            Assert.Equal(0, gate.BudgetLeft(decision.LookAgainAt.AddSeconds(-1), spends));
        }
        else
        {
            // Nothing fresh, or no budget at all: only the window opening can change the answer.
            Assert.Equal(change, decision.LookAgainAt);
        }
    }

    [Fact]
    public void Spent_budget_frees_when_enough_old_grants_age_out()
    {
        var gate = new EncoderGate(Nights, 10);
        var queued = new QueuedPages(50, 0, 0);

        // Hand computation: at 10:00, grants 09:10 (6) + 09:40 (4) = 10 spent, none left. At 10:10 the
        // 09:10 grant ages out (one hour), leaving 4 spent and 6 free.
        var full = gate.Decide(OutsideWindow, queued, [new(OutsideWindow.AddMinutes(-50), 6), new(OutsideWindow.AddMinutes(-20), 4)]);
        Assert.Equal(GateMode.Waiting, full.Mode);
        Assert.Equal(OutsideWindow.AddMinutes(10), full.LookAgainAt);

        // Over-spent (22 of 10): at 10:10 the 2-page grant ages out, 20 still spent; at 10:20 the 20-page
        // grant does, all 10 free. So 10:20.
        var over = gate.Decide(OutsideWindow, queued, [new(OutsideWindow.AddMinutes(-50), 2), new(OutsideWindow.AddMinutes(-40), 20)]);
        Assert.Equal(OutsideWindow.AddMinutes(20), over.LookAgainAt);

        var partly = gate.Decide(OutsideWindow, queued, [new(OutsideWindow.AddMinutes(-20), 7)]);
        Assert.Equal(GateMode.Budget, partly.Mode);
        Assert.Equal(3, partly.PagesAllowed);
    }

    [Fact]
    public void Migration_and_canary_work_waits_for_the_window_even_with_budget_left()
    {
        var gate = new EncoderGate(Nights, 1000);
        var decision = gate.Decide(OutsideWindow, new QueuedPages(0, 500, 20), []);
        Assert.Equal(GateMode.Waiting, decision.Mode);
        Assert.Equal(new DateTimeOffset(2026, 12, 8, 19, 0, 0, TimeSpan.Zero), decision.LookAgainAt);
    }

    [Fact]
    public void Ledger_forgets_grants_one_period_old()
    {
        var ledger = new BudgetLedger();
        ledger.Record(OutsideWindow, 5);
        ledger.Record(OutsideWindow.AddMinutes(30), 0);
        ledger.Record(OutsideWindow.AddMinutes(30), 3);
        Assert.Equal(2, ledger.Spends(OutsideWindow.AddMinutes(59)).Count);
        Assert.Equal([new BudgetSpend(OutsideWindow.AddMinutes(30), 3)], ledger.Spends(OutsideWindow.AddMinutes(60)));
    }
}
