namespace IndexKeeper.Core.Catalog;

/// <summary>Referenced pages (held by live documents) against the live vector sets of two encoders.</summary>
/// <param name="Referenced">Page keys live documents hold.</param>
/// <param name="CoveredServing">Of these, those with a live vector set of the serving encoder.</param>
/// <param name="CoveredActive">Of these, those with a live vector set of the active encoder.</param>
/// <param name="UncoveredNotQueued">Referenced pages the serving encoder does not cover that no queue entry waits for.</param>
public sealed record PageCoverage(long Referenced, long CoveredServing, long CoveredActive, long UncoveredNotQueued);
