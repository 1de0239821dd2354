namespace IndexKeeper.Service.Configuration;

/// <summary>Canary checks for silent drift (docs/encoders.md, "Canaries").</summary>
public sealed class DriftOptions
{
    /// <summary>Canary pages re-embedded per check (the live pages with the lowest page keys); 0 turns canaries off.</summary>
    public int CanaryPages { get; set; } = 16;

    /// <summary>The index is marked drifted when the mean cosine of canary vectors falls below this.</summary>
    public double CanaryMinimumMeanCosine { get; set; } = 0.999;

    /// <summary>... or when any one canary vector's cosine falls below this.</summary>
    public double CanaryMinimumCosine { get; set; } = 0.99;

    /// <summary>How often the daemon checks the canaries.</summary>
    public double CanaryIntervalHours { get; set; } = 24;
}
