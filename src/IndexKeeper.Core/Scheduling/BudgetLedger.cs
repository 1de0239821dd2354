namespace IndexKeeper.Core.Scheduling;

/// <summary>
/// The budget grants of the last period, kept in memory by the one process that drives the encoder.
/// Not thread-safe: the embed loop alone records and reads it.
/// </summary>
public sealed class BudgetLedger
{
    private readonly List<BudgetSpend> spends = [];

    /// <summary>Records a grant made in <see cref="GateMode.Budget"/> (window grants are not budget).</summary>
    public void Record(DateTimeOffset at, long pages)
    {
        ArgumentOutOfRangeException.ThrowIfNegative(pages);
        if (pages > 0)
        {
            spends.Add(new BudgetSpend(at, pages));
        }
    }

    /// <summary>The grants that still count at <paramref name="now"/>; older ones are forgotten.</summary>
    public IReadOnlyList<BudgetSpend> Spends(DateTimeOffset now)
    {
        spends.RemoveAll(s => s.At + EncoderGate.BudgetPeriod <= now);
        return spends.ToArray();
    }
}
