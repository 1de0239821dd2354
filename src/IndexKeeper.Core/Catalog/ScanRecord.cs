namespace IndexKeeper.Core.Catalog;

/// <summary>One finished scan pass (collection <c>scans</c>): when, and what it found.</summary>
public sealed class ScanRecord
{
    public int Id { get; set; }

    public DateTime StartedUtc { get; set; }

    public double ElapsedSeconds { get; set; }

    public string Command { get; set; } = string.Empty;

    public Dictionary<string, long> Counts { get; set; } = [];
}
