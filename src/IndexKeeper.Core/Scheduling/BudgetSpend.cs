namespace IndexKeeper.Core.Scheduling;

/// <summary>Pages granted from the daytime budget at one instant; they count against it for one budget period.</summary>
public readonly record struct BudgetSpend(DateTimeOffset At, long Pages);
