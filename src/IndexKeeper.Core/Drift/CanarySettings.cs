namespace IndexKeeper.Core.Drift;

/// <summary>How a canary check samples and judges (docs/encoders.md, "Canaries"); validated by the host.</summary>
/// <param name="Pages">Canary pages: the live pages with the lowest page keys (page keys are SHA-256, so the sample is spread evenly and stays the same between checks).</param>
/// <param name="MinimumMeanCosine">Below this mean cosine over all canary vectors the index is marked drifted.</param>
/// <param name="MinimumCosine">Below this cosine of any single canary vector the index is marked drifted.</param>
public sealed record CanarySettings(int Pages = 16, double MinimumMeanCosine = 0.999, double MinimumCosine = 0.99);
