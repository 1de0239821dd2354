using IndexKeeper.Core.Encoding;
using LiteDB;

namespace IndexKeeper.Core.Catalog;

/// <summary>The catalog's vector-set directory: encoders, segments, and where each vector set lives.</summary>
public sealed partial class IndexCatalog
{
    public void RegisterEncoder(EncoderIdentity identity)
    {
        ArgumentNullException.ThrowIfNull(identity);
        if (encoders.FindById(identity.Id) is null)
        {
            encoders.Insert(new EncoderRecord
            {
                Id = identity.Id,
                Name = identity.Name,
                Description = identity.Description,
                Dimensions = identity.Dimensions,
                FirstUsedUtc = DateTime.UtcNow,
            });
        }
    }

    public IReadOnlyList<EncoderRecord> Encoders() => encoders.FindAll().ToList();

    /// <summary>Hands out a segment id never used in this index (a counter in <c>meta</c>, committed at once).</summary>
    public long AllocateSegmentId()
    {
        var meta = database.GetCollection(CatalogSchema.Meta);
        var counter = meta.FindById(CatalogSchema.SegmentCounterMetaId) ?? new BsonDocument { ["_id"] = CatalogSchema.SegmentCounterMetaId, ["next"] = 1L };
        var id = counter["next"].AsInt64;
        counter["next"] = id + 1;
        meta.Upsert(counter);
        return id;
    }

    public SegmentRecord? FindOpenSegment(string encoderId) =>
        segments.FindOne(s => s.EncoderId == encoderId && !s.Sealed);

    public SegmentRecord? FindSegment(long segmentId) => segments.FindById(segmentId);

    public IReadOnlyList<SegmentRecord> Segments() => segments.FindAll().OrderBy(s => s.Id).ToList();

    public VectorSetRecord? FindVectorSet(string encoderId, string pageKey) => vectorSets.FindById(VectorSetRecord.MakeId(encoderId, pageKey));

    /// <summary>
    /// The live vector sets of an encoder in page-key order. Search numbers pages by this order and gives
    /// equal scores to the lower number, so ties rank alike in every index holding the same vector sets,
    /// whatever segments and offsets the history of the index left them in (a rebuild equals the original).
    /// </summary>
    public IReadOnlyList<VectorSetRecord> LiveVectorSets(string encoderId) =>
        vectorSets.Find(v => v.EncoderId == encoderId && v.Live).OrderBy(v => v.PageKey, StringComparer.Ordinal).ToList();

    public IReadOnlyList<VectorSetRecord> VectorSetsOfSegment(long segmentId) => vectorSets.Find(v => v.SegmentId == segmentId).ToList();

    public long CountVectorSets(bool liveOnly) => liveOnly ? vectorSets.LongCount(v => v.Live) : vectorSets.LongCount();

    /// <summary>Live documents holding a page key: where a search hit is shown.</summary>
    public IReadOnlyList<DocumentRecord> DocumentsHolding(string pageKey) =>
        documents.Find(BsonExpression.Create("$.PageKeys[*] ANY = @0", new BsonValue(pageKey))).ToList();

    /// <summary>
    /// Makes a batch of vector sets live in one transaction: the segment's committed length and counts,
    /// the new vector sets, and the queue entries they satisfy. REQUIRES: the segment bytes up to
    /// <paramref name="segment"/>.Length are durable.
    /// </summary>
    public void CommitEmbedded(SegmentRecord segment, IReadOnlyList<VectorSetRecord> added, IReadOnlyList<string> dequeued)
    {
        ArgumentNullException.ThrowIfNull(segment);
        ArgumentNullException.ThrowIfNull(added);
        ArgumentNullException.ThrowIfNull(dequeued);
        database.BeginTrans();
        try
        {
            foreach (var set in added)
            {
                // A key whose last page location went away while it was being encoded is born dead.
                set.Live = ReferencesOf(set.PageKey) > 0;
                segment.RecordCount++;
                if (set.Live)
                {
                    segment.LiveBytes += set.Length;
                    segment.LiveRecordCount++;
                }
            }

            segments.Upsert(segment);
            vectorSets.Upsert(added);
            foreach (var key in dequeued)
            {
                queue.Delete(key);
            }

            database.Commit();
        }
        catch
        {
            database.Rollback();
            throw;
        }
    }

    /// <summary>Removes queue entries whose page already has vectors (nothing to encode).</summary>
    public void Dequeue(IEnumerable<string> pageKeys)
    {
        foreach (var key in pageKeys)
        {
            queue.Delete(key);
        }
    }

    /// <summary>Records the failed attempt of a page and when it may be tried again.</summary>
    public void DeferQueued(string pageKey, DateTime notBeforeUtc)
    {
        if (queue.FindById(pageKey) is { } entry)
        {
            entry.Attempts++;
            entry.NotBeforeUtc = notBeforeUtc;
            queue.Update(entry);
        }
    }

    /// <summary>
    /// Records a failed attempt with its reason: the page is tried again at <paramref name="nextTryUtc"/>,
    /// or quarantined when that is null. Returns the page's failed attempts so far (0 when it is no longer queued).
    /// </summary>
    public int RecordFailure(string pageKey, Func<int, DateTime?> nextTryUtc, string reason, DateTime nowUtc)
    {
        ArgumentNullException.ThrowIfNull(nextTryUtc);
        if (queue.FindById(pageKey) is not { } entry)
        {
            return 0;
        }

        entry.Attempts++;
        entry.LastError = reason;
        if (nextTryUtc(entry.Attempts) is { } next)
        {
            entry.NotBeforeUtc = next;
        }
        else
        {
            entry.NotBeforeUtc = QueueRecord.QuarantinedNotBefore;
            entry.QuarantinedUtc = nowUtc;
        }

        queue.Update(entry);
        return entry.Attempts;
    }

    public void PutSegment(SegmentRecord segment) => segments.Upsert(segment);

    /// <summary>
    /// Swaps compaction outputs in at once: the moved vector sets point into the new segments, dead vector
    /// sets of the old segments are forgotten, the old segments leave the catalog. The old files may be
    /// deleted only after this commit.
    /// </summary>
    public void SwapCompacted(IReadOnlyList<long> oldSegmentIds, IReadOnlyList<SegmentRecord> newSegments, IReadOnlyDictionary<(long SegmentId, long Offset), (long SegmentId, long Offset)> moves)
    {
        ArgumentNullException.ThrowIfNull(oldSegmentIds);
        ArgumentNullException.ThrowIfNull(newSegments);
        ArgumentNullException.ThrowIfNull(moves);
        database.BeginTrans();
        try
        {
            foreach (var oldId in oldSegmentIds)
            {
                foreach (var set in vectorSets.Find(v => v.SegmentId == oldId).ToList())
                {
                    if (set.Live && moves.TryGetValue((set.SegmentId, set.Offset), out var to))
                    {
                        set.SegmentId = to.SegmentId;
                        set.Offset = to.Offset;
                        vectorSets.Update(set);
                    }
                    else if (set.Live)
                    {
                        throw new InvalidOperationException($"compaction lost the live vector set {set.Id}; nothing was swapped.");
                    }
                    else
                    {
                        vectorSets.Delete(set.Id);
                    }
                }

                segments.Delete(oldId);
            }

            segments.Upsert(newSegments);
            database.Commit();
        }
        catch
        {
            database.Rollback();
            throw;
        }
    }

    /// <summary>
    /// Forgets vector sets whose bytes are lost or damaged, fixes the counts of their segments, and queues
    /// again every page a live document still holds; with <paramref name="dropSegments"/> the segments'
    /// records go too. Returns the number of pages queued again.
    /// </summary>
    public int ForgetVectorSets(IReadOnlyList<VectorSetRecord> lost, IReadOnlyCollection<long> dropSegments)
    {
        ArgumentNullException.ThrowIfNull(lost);
        ArgumentNullException.ThrowIfNull(dropSegments);
        var now = DateTime.UtcNow;
        var requeued = 0;
        database.BeginTrans();
        try
        {
            foreach (var set in lost)
            {
                vectorSets.Delete(set.Id);
                if (segments.FindById(set.SegmentId) is { } segment)
                {
                    segment.RecordCount--;
                    if (set.Live)
                    {
                        segment.LiveRecordCount--;
                        segment.LiveBytes -= set.Length;
                    }

                    segments.Update(segment);
                }

                if (set.Live && ReferencesOf(set.PageKey) > 0)
                {
                    queue.Upsert(new QueueRecord { Id = set.PageKey, Priority = QueuePriority.Fresh, EnqueuedUtc = now, NotBeforeUtc = now });
                    requeued++;
                }
            }

            foreach (var id in dropSegments)
            {
                segments.Delete(id);
            }

            database.Commit();
            return requeued;
        }
        catch
        {
            database.Rollback();
            throw;
        }
    }

    /// <summary>A page's reference count (0 when it has no record), read without deserialising its words.</summary>
    private int ReferencesOf(string pageKey) =>
        pages.Query().Where(p => p.Id == pageKey).Select(p => p.References).ToEnumerable().FirstOrDefault();

    /// <summary>REQUIRES: inside a transaction of the caller.</summary>
    private void SetVectorSetsLive(string pageKey, bool live)
    {
        HashSet<string>? retired = null;
        foreach (var set in vectorSets.Find(v => v.PageKey == pageKey && v.Live != live).ToList())
        {
            if (segments.FindById(set.SegmentId) is not { } segment)
            {
                continue;
            }

            // A restored page brings back only vectors of encoders still in use; a retired encoder's stay dead.
            retired ??= live ? RetiredEncoderIds() : [];
            if (live && retired.Contains(set.EncoderId))
            {
                continue;
            }

            set.Live = live;
            vectorSets.Update(set);
            var sign = live ? 1 : -1;
            segment.LiveBytes += sign * set.Length;
            segment.LiveRecordCount += sign;
            segments.Update(segment);
        }
    }
}
