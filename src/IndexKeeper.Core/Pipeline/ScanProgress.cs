namespace IndexKeeper.Core.Pipeline;

/// <summary>Progress of a scan for a terminal or a log: the phase, files done of files found, the current file.</summary>
public readonly record struct ScanProgress(string Phase, long Done, long Total, string? Current);
