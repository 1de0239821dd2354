using IndexKeeper.Core.Pipeline;

namespace IndexKeeper.Churn.Strategies;

/// <summary>What one day's sync and compaction of strategy (c) did and cost.</summary>
internal sealed record KeeperDay(ScanSummary Summary, double ScanSeconds, double SyncSeconds, long BytesEmbedded, long BytesCompacted, double TotalSeconds);
