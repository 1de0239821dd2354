namespace IndexKeeper.Core.Detect;

/// <summary>The quick check's verdict and the differences behind it (for plans and metrics).</summary>
public readonly record struct QuickCheckResult(QuickCheckVerdict Verdict, StatDifferences Differences);
