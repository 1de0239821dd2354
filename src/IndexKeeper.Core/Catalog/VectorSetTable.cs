using LiteDB;

namespace IndexKeeper.Core.Catalog;

/// <summary>The vector-set directory: for each (encoder, page key), where its bytes are and whether it is live.</summary>
public sealed class VectorSetTable
{
    private readonly ILiteCollection<VectorSetRecord> vectorSets;

    internal VectorSetTable(CatalogStore store) => vectorSets = store.VectorSets;

    public VectorSetRecord? Find(string encoderId, string pageKey) => vectorSets.FindById(VectorSetRecord.MakeId(encoderId, pageKey));

    /// <summary>As <see cref="Find"/> for many pages of one encoder at once, by page key (a page without a record is absent).</summary>
    public Dictionary<string, VectorSetRecord> Find(string encoderId, IEnumerable<string> pageKeys) =>
        ByKeys.Find(vectorSets, pageKeys.Select(k => VectorSetRecord.MakeId(encoderId, k)), v => v.PageKey);

    /// <summary>
    /// The live vector sets of an encoder in page-key order. Search numbers pages by this order and gives
    /// equal scores to the lower number, so ties rank alike in every index holding the same vector sets,
    /// whatever segments and offsets the history of the index left them in (a rebuild equals the original).
    /// </summary>
    public IReadOnlyList<VectorSetRecord> Live(string encoderId) =>
        vectorSets.Find(v => v.EncoderId == encoderId && v.Live).OrderBy(v => v.PageKey, StringComparer.Ordinal).ToList();

    public IReadOnlyList<VectorSetRecord> OfSegment(long segmentId) => vectorSets.Find(v => v.SegmentId == segmentId).ToList();

    public long Count(bool liveOnly) => liveOnly ? vectorSets.LongCount(v => v.Live) : vectorSets.LongCount();

    /// <summary>Page keys with a live vector set under an encoder, read without the vector-set records' other fields.</summary>
    public IReadOnlySet<string> LivePageKeysOf(string encoderId) =>
        vectorSets.Query().Where(v => v.EncoderId == encoderId && v.Live).Select(v => v.PageKey).ToEnumerable().ToHashSet(StringComparer.Ordinal);

    /// <summary>Vector-set counts of every encoder id: (live, total).</summary>
    public IReadOnlyDictionary<string, (long Live, long Total)> CountsByEncoder()
    {
        var counts = new Dictionary<string, (long Live, long Total)>(StringComparer.Ordinal);
        foreach (var row in vectorSets.Query().Select(v => new { v.EncoderId, v.Live }).ToEnumerable())
        {
            var (live, total) = counts.GetValueOrDefault(row.EncoderId);
            counts[row.EncoderId] = (live + (row.Live ? 1 : 0), total + 1);
        }

        return counts;
    }

    /// <summary>Vector sets and vectors under one encoder: the measured vectors per page.</summary>
    public (long VectorSets, long Vectors) VectorCounts(string encoderId)
    {
        var counts = vectorSets.Find(v => v.EncoderId == encoderId).Select(v => (long)v.VectorCount).ToList();
        return (counts.Count, counts.Sum());
    }
}
