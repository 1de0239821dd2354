namespace IndexKeeper.Cli.Commands;

/// <summary>What <c>repair</c> did (<c>--json</c>): one line per change, naming what was dropped.</summary>
internal sealed record RepairReport(IReadOnlyList<string> Repairs, int SegmentsDamaged);
