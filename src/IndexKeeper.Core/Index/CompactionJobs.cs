using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Compaction;

namespace IndexKeeper.Core.Index;

/// <summary>
/// The one rule of "compaction due" (docs/compaction.md, "When compaction is due"), shared by the daemon,
/// <c>compact</c> and <c>plan</c>: the policy runs over every segment of the catalog as if the open ones
/// were sealed, because whoever compacts seals them first (<see cref="VectorStore.Compact"/>). So the jobs
/// a plan reports are the jobs the next compaction runs, and due means at least one job. Reads only.
/// </summary>
public static class CompactionJobs
{
    public static IReadOnlyList<CompactionJob> Due(IndexCatalog catalog, CompactionOptions options)
    {
        ArgumentNullException.ThrowIfNull(catalog);
        ArgumentNullException.ThrowIfNull(options);
        return CompactionPolicy.Plan(catalog.Segments.All().Select(Stats).ToList(), options);
    }

    /// <summary>What the policy knows of one segment, as the catalog counts it; an open segment counts as sealed.</summary>
    private static SegmentStats Stats(SegmentRecord segment) => new(
        segment.Id,
        segment.EncoderId,
        Sealed: true,
        segment.Length,
        segment.LiveBytes,
        segment.RecordCount,
        segment.LiveRecordCount,
        new DateTimeOffset(segment.CreatedUtc.ToUniversalTime(), TimeSpan.Zero));
}
