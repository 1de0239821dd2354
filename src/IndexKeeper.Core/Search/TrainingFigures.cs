namespace IndexKeeper.Core.Search;

/// <summary>
/// The running counts a serving view keeps for the retraining decision (docs/search.md, "Retraining") and writes in
/// its file (docs/serving-view.md): when its centroids were trained, the first page id given after that, every live
/// vector and those of pages added since. Kept by each change, never recounted.
/// </summary>
/// <param name="TrainedAt">When the centroids were trained; null when not known.</param>
/// <param name="FirstIdAfterTraining">Pages with this id or a later one came after the training (<see cref="ulong.MaxValue"/>: none).</param>
internal sealed record TrainingFigures(DateTimeOffset? TrainedAt, ulong FirstIdAfterTraining, long Vectors, long VectorsAddedSinceTraining)
{
    /// <summary>Share of the live vectors added after training; null when the training time is not known or there are none.</summary>
    public double? AddedShare => TrainedAt is null || Vectors == 0 ? null : (double)VectorsAddedSinceTraining / Vectors;
}
