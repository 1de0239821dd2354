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

    public static DaemonFigures Empty { get; } = new(DateTimeOffset.MinValue, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, null, new DamageReport());
}
