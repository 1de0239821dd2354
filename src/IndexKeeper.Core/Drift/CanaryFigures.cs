namespace IndexKeeper.Core.Drift;

/// <summary>
/// The result of comparing stored canary vectors with fresh ones: per-vector cosines summarised over all
/// canary pages, and whether they fell below the thresholds.
/// </summary>
/// <param name="Pages">Canary pages compared.</param>
/// <param name="Vectors">Vector pairs compared.</param>
/// <param name="MismatchedPages">Pages whose fresh vector count differs from the stored one (each such page sets the minimum to 0 and marks drift).</param>
/// <param name="MeanCosine">Mean of the per-vector cosines (1 when nothing was compared).</param>
/// <param name="MinimumCosine">Lowest per-vector cosine (1 when nothing was compared).</param>
/// <param name="Drifted">Mean or minimum fell below its threshold, or a count mismatched.</param>
public sealed record CanaryFigures(int Pages, long Vectors, int MismatchedPages, double MeanCosine, double MinimumCosine, bool Drifted);
