using IndexKeeper.Core.Search;

namespace IndexKeeper.Service.Application;

/// <summary>What one retraining of a serving view did (<see cref="ServingViews.Retrain"/>).</summary>
/// <param name="Swapped">True when the new view replaced the old (its recall figure was no worse).</param>
/// <param name="Before">The old view's figure, measured just before, on the same sample queries as <paramref name="After"/>.</param>
/// <param name="After">The new view's figure.</param>
/// <param name="Centroids">Centroids the new view trained.</param>
/// <param name="Pages">Pages of the new view.</param>
/// <param name="BuildWallSeconds">Wall seconds of the build (training and assignment).</param>
/// <param name="BuildSecondsPerPage">CPU seconds per page of the build.</param>
public sealed record ViewRetraining(bool Swapped, CandidateRecall Before, CandidateRecall After, int Centroids, int Pages, double BuildWallSeconds, double? BuildSecondsPerPage);
