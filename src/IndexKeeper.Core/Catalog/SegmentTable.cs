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

    public SegmentRecord? Find(long segmentId) => segments.FindById(segmentId);

    public IReadOnlyList<SegmentRecord> All() => segments.FindAll().OrderBy(s => s.Id).ToList();

    public void Put(SegmentRecord segment) => segments.Upsert(segment);

    /// <summary>
    /// Segments compaction swapped out whose files may still be on disk: a reader in another process held
    /// the reader gate when they were to be deleted (docs/catalog.md, "Readers beside a writer").
    /// </summary>
    public IReadOnlySet<long> RetiredIds() =>
        meta.FindById(CatalogSchema.RetiredSegmentsMetaId)?["ids"].AsArray.Select(v => v.AsInt64).ToHashSet() ?? [];

    /// <summary>Stops listing <paramref name="segmentIds"/> as retired (their files are gone).</summary>
    public void ForgetRetired(IReadOnlyCollection<long> segmentIds)
    {
        ArgumentNullException.ThrowIfNull(segmentIds);
        if (segmentIds.Count > 0)
        {
            WriteRetired(RetiredIds().Except(segmentIds));
        }
    }

    /// <summary>REQUIRES: inside the swap's transaction.</summary>
    internal void AddRetired(IEnumerable<long> segmentIds) => WriteRetired(RetiredIds().Union(segmentIds));

    private void WriteRetired(IEnumerable<long> ids)
    {
        var list = ids.Order().ToList();
        if (list.Count == 0)
        {
            meta.Delete(CatalogSchema.RetiredSegmentsMetaId);
            return;
        }

        meta.Upsert(new BsonDocument { ["_id"] = CatalogSchema.RetiredSegmentsMetaId, ["ids"] = new BsonArray(list.Select(id => new BsonValue(id))) });
    }
}
