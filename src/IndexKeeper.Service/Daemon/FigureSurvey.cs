using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Queue;
using IndexKeeper.Service.Application;

namespace IndexKeeper.Service.Daemon;

/// <summary>
/// The figures of a full sample beyond the catalog's counts: per-root totals, unsupported files by type,
/// pages searches cannot find yet, and the migration's progress and forecast. Runs on the work loop's
/// thread (the gate's budget belongs to it); reads only: the catalog's running counts, refreshed by the caller,
/// and a few small records, so it costs the same at any index size.
/// </summary>
internal static class FigureSurvey
{
    /// <summary>Types listed one by one; the rest are summed as "other", so a drive full of odd names cannot flood the metrics.</summary>
    public const int MaxTypes = 20;

    /// <param name="coverage">The running counts' coverage of the serving encoder <paramref name="servingId"/> and the active one.</param>
    public static DaemonFigures Complete(DaemonFigures figures, OpenIndex index, IEmbedGate gate, string servingId, PageCoverage coverage)
    {
        var catalog = index.Catalog;
        var active = index.Encoder.Identity;
        var moved = coverage.CoveredActive;
        var waiting = Math.Max(figures.QueuedMigration, servingId == active.Id ? 0 : coverage.Referenced - moved);

        DateTimeOffset? finish = null;
        var notInSight = false;
        if (waiting > 0 && catalog.History.MeasuredThroughput(active.Id, PlanOperation.HistoryRuns) is { } measured)
        {
            var forecast = gate.Forecast(figures.At, new QueuedPages(figures.QueuedFresh, waiting, figures.QueuedCanary), measured.SecondsPerPage);
            finish = forecast.MigrationDone;
            notInSight = finish is null;
        }

        var types = catalog.History.LastScan()?.UnsupportedTypes.OrderByDescending(t => t.Files).ThenBy(t => t.Type, StringComparer.Ordinal).ToList() ?? [];
        if (types.Count > MaxTypes)
        {
            types = [.. types.Take(MaxTypes - 1), new TypeCount { Type = "other", Files = types.Skip(MaxTypes - 1).Sum(t => t.Files) }];
        }

        return figures with
        {
            RootTotals = catalog.Counts.TotalsByRoot(),
            UnsupportedTypes = types,
            PagesWithoutVectors = coverage.Referenced - coverage.CoveredServing,
            Migration = new MigrationFigures(
                catalog.Encoders.Find(servingId)?.Name ?? active.Name, servingId, active.Name, active.Id, moved, coverage.Referenced, waiting, finish, notInSight),
        };
    }
}
