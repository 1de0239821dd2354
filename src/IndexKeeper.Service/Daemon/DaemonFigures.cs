using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Index;

namespace IndexKeeper.Service.Daemon;

/// <summary>Figures of the index sampled by the work loop (metrics, health and the status page read these, never the catalog).</summary>
internal sealed record DaemonFigures(
    DateTimeOffset At,
    long DocumentsLive,
    long DocumentsQuarantined,
    long DocumentsUnsupported,
    long FilesSkippedByPattern,
    long FilesUnsupported,
    long Pages,
    long PagesWithVectors,
    long QueuedFresh,
    long QueuedMigration,
    long QueuedCanary,
    long PagesQuarantined,
    long SegmentsOpen,
    long SegmentsSealed,
    double DeadRatio,
    long BytesOnDisk,
    double? FreeShare,
    DamageReport Damage)
{
    public long Queued => QueuedFresh + QueuedMigration + QueuedCanary;

    /// <summary>Documents, pages and bytes per root (roots with no document are absent).</summary>
    public IReadOnlyList<RootTotals> RootTotals { get; init; } = [];

    /// <summary>Files of a type no reader takes that the last full pass walked past, by type.</summary>
    public IReadOnlyList<TypeCount> UnsupportedTypes { get; init; } = [];

    /// <summary>Pages no live vector set of the serving encoder covers: not found by searches yet.</summary>
    public long PagesWithoutVectors { get; init; }

    public MigrationFigures Migration { get; init; } = MigrationFigures.None;

    public static DaemonFigures Empty { get; } = new(DateTimeOffset.MinValue, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, null, new DamageReport());
}
