using IndexKeeper.Core.Compaction;
using LiteDB;

namespace IndexKeeper.Core.Catalog;

/// <summary>The catalog's segments: id, encoder, committed length, live counts, open or sealed.</summary>
public sealed class SegmentTable
{
    private readonly ILiteCollection<SegmentRecord> segments;
    private readonly ILiteCollection<BsonDocument> meta;

    internal SegmentTable(CatalogStore store)
    {
        segments = store.Segments;
        meta = store.Meta;
    }

    /// <summary>Hands out a segment id never used in this index (a counter in <c>meta</c>, committed at once).</summary>
    public long AllocateId()
    {
        var counter = meta.FindById(CatalogSchema.SegmentCounterMetaId) ?? new BsonDocument { ["_id"] = CatalogSchema.SegmentCounterMetaId, ["next"] = 1L };
        var id = counter["next"].AsInt64;
        counter["next"] = id + 1;
        meta.Upsert(counter);
        return id;
    }

    /// <summary>Makes sure <see cref="AllocateId"/> never hands out <paramref name="segmentId"/> or a lower id (a catalog rebuilt from files).</summary>
    public void ReserveIdsThrough(long segmentId)
    {
        var counter = meta.FindById(CatalogSchema.SegmentCounterMetaId) ?? new BsonDocument { ["_id"] = CatalogSchema.SegmentCounterMetaId, ["next"] = 1L };
        if (counter["next"].AsInt64 <= segmentId)
        {
            counter["next"] = segmentId + 1;
            meta.Upsert(counter);
        }
    }

    public SegmentRecord? FindOpen(string encoderId) => segments.FindOne(s => s.EncoderId == encoderId && !s.Sealed);

    public SegmentRecord? Find(long segmentId) => segments.FindById(segmentId);

    public IReadOnlyList<SegmentRecord> All() => segments.FindAll().OrderBy(s => s.Id).ToList();

    public void Put(SegmentRecord segment) => segments.Upsert(segment);

    /// <summary>
    /// What the compaction policy knows of every segment, the one mapping the daemon, <c>compact</c> and
    /// <c>plan</c> share (docs/compaction.md, "When compaction is due"): open segments count as sealed,
    /// because whoever compacts seals them first, so plan and compaction always see the same jobs.
    /// </summary>
    public IReadOnlyList<SegmentStats> Stats() => All().Select(s => new SegmentStats(
        s.Id,
        s.EncoderId,
        Sealed: true,
        s.Length,
        s.LiveBytes,
        s.RecordCount,
        s.LiveRecordCount,
        new DateTimeOffset(s.CreatedUtc.ToUniversalTime(), TimeSpan.Zero))).ToList();
}
