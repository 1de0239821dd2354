using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Queue;
using IndexKeeper.Service.Application;

namespace IndexKeeper.Service.Daemon;

/// <summary>
/// The figures of a full sample beyond the catalog's counts: per-root totals, unsupported files by type,
/// pages searches cannot find yet, and the migration's progress and forecast. Runs on the work loop's
/// thread (the gate's budget belongs to it); reads only.
/// </summary>
internal static class FigureSurvey
{
    /// <summary>Types listed one by one; the rest are summed as "other", so a drive full of odd names cannot flood the metrics.</summary>
    public const int MaxTypes = 20;

    public static DaemonFigures Complete(DaemonFigures figures, OpenIndex index, IEmbedGate gate)
    {
        var catalog = index.Catalog;
        var active = index.Encoder.Identity;
        var servingId = catalog.Encoders.ServingId() ?? active.Id;
        var referenced = catalog.Pages.ReferencedKeys().ToList();
        var servingKeys = catalog.VectorSets.LivePageKeysOf(servingId);
        var activeKeys = servingId == active.Id ? servingKeys : catalog.VectorSets.LivePageKeysOf(active.Id);
        var moved = referenced.LongCount(activeKeys.Contains);
        var waiting = Math.Max(figures.QueuedMigration, servingId == active.Id ? 0 : referenced.Count - moved);

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
            RootTotals = catalog.Documents.TotalsByRoot(),
            UnsupportedTypes = types,
            PagesWithoutVectors = referenced.LongCount(k => !servingKeys.Contains(k)),
            Migration = new MigrationFigures(
                catalog.Encoders.Find(servingId)?.Name ?? active.Name, servingId, active.Name, active.Id, moved, referenced.Count, waiting, finish, notInSight),
        };
    }
}
