using IndexKeeper.Core.Drift;
using IndexKeeper.Core.Encoding;
using LiteDB;

namespace IndexKeeper.Core.Catalog;

/// <summary>The catalog's part in drift tracking: the serving encoder, encoder settings, retirement, canary figures.</summary>
public sealed partial class IndexCatalog
{
    /// <summary>The encoder searches rank with (meta <c>servingEncoder</c>); null until first recorded.</summary>
    public string? ServingEncoderId()
    {
        var meta = database.GetCollection(CatalogSchema.Meta);
        return meta.FindById(CatalogSchema.ServingEncoderMetaId) is { } doc ? doc["encoderId"].AsString : null;
    }

    public EncoderRecord? FindEncoder(string encoderId) => encoders.FindById(encoderId);

    public void PutEncoder(EncoderRecord record) => encoders.Upsert(record);

    /// <summary>
    /// Records the configured encoder with the settings that build it again; an encoder configured again
    /// after retirement is in use once more (its dead vectors are not revived: they are embedded afresh).
    /// </summary>
    public void RegisterEncoder(EncoderIdentity identity, IReadOnlyDictionary<string, string> settings)
    {
        ArgumentNullException.ThrowIfNull(identity);
        ArgumentNullException.ThrowIfNull(settings);
        var record = encoders.FindById(identity.Id) ?? new EncoderRecord
        {
            Id = identity.Id,
            Name = identity.Name,
            Description = identity.Description,
            Dimensions = identity.Dimensions,
            FirstUsedUtc = DateTime.UtcNow,
        };
        record.Settings = new Dictionary<string, string>(settings, StringComparer.Ordinal);
        record.Retired = false;
        record.RetiredUtc = null;
        encoders.Upsert(record);
    }

    /// <summary>Page keys with a live vector set under an encoder, read without the vector-set records' other fields.</summary>
    public IReadOnlySet<string> LivePageKeysOf(string encoderId) =>
        vectorSets.Query().Where(v => v.EncoderId == encoderId && v.Live).Select(v => v.PageKey).ToEnumerable().ToHashSet(StringComparer.Ordinal);

    /// <summary>Vector-set counts of every encoder id: (live, total).</summary>
    public IReadOnlyDictionary<string, (long Live, long Total)> VectorSetCountsByEncoder()
    {
        var counts = new Dictionary<string, (long Live, long Total)>(StringComparer.Ordinal);
        foreach (var row in vectorSets.Query().Select(v => new { v.EncoderId, v.Live }).ToEnumerable())
        {
            var (live, total) = counts.GetValueOrDefault(row.EncoderId);
            counts[row.EncoderId] = (live + (row.Live ? 1 : 0), total + 1);
        }

        return counts;
    }

    /// <summary>What <see cref="DriftPolicy"/> needs, read from the catalog.</summary>
    public DriftFacts ReadDriftFacts(string activeEncoderId)
    {
        var known = encoders.FindAll().ToList();
        var pagesByEncoder = new Dictionary<string, IReadOnlySet<string>>(StringComparer.Ordinal);
        // Every encoder that wrote a vector set is registered by the store's append (VectorStore), so the
        // encoder records name them all without a pass over every vector set (status asks this on each call).
        foreach (var id in known.Select(e => e.Id))
        {
            pagesByEncoder[id] = LivePageKeysOf(id);
        }

        return new DriftFacts(
            activeEncoderId,
            ServingEncoderId(),
            pagesByEncoder,
            queue.Query().Select(q => q.Id).ToEnumerable().ToHashSet(StringComparer.Ordinal),
            known.Where(e => e.Retired).Select(e => e.Id).ToHashSet(StringComparer.Ordinal));
    }

    /// <summary>
    /// Applies a drift decision in one transaction: migration queue entries, retired encoders' vector sets
    /// made dead (segment counts with them, so compaction reclaims the bytes), and the serving encoder. A
    /// switch-over is therefore atomic: before the commit searches use the old vectors, after it the new.
    /// </summary>
    public void ApplyDrift(DriftDecision decision, DateTime nowUtc)
    {
        ArgumentNullException.ThrowIfNull(decision);
        if (decision.QueueForMigration.Count == 0 && decision.RetireEncoders.Count == 0 && !decision.RecordServing)
        {
            return;
        }

        database.BeginTrans();
        try
        {
            queue.Upsert(decision.QueueForMigration.Select(key => new QueueRecord
            {
                Id = key,
                Priority = QueuePriority.Migration,
                EnqueuedUtc = nowUtc,
                NotBeforeUtc = nowUtc,
            }));
            foreach (var encoderId in decision.RetireEncoders)
            {
                Retire(encoderId, nowUtc);
            }

            if (decision.RecordServing)
            {
                database.GetCollection(CatalogSchema.Meta).Upsert(new BsonDocument
                {
                    ["_id"] = CatalogSchema.ServingEncoderMetaId,
                    ["encoderId"] = decision.ServingEncoderId,
                    ["sinceUtc"] = nowUtc,
                });
            }

            database.Commit();
        }
        catch
        {
            database.Rollback();
            throw;
        }
    }

    /// <summary>REQUIRES: inside a transaction of the caller.</summary>
    private void Retire(string encoderId, DateTime nowUtc)
    {
        foreach (var set in vectorSets.Find(v => v.EncoderId == encoderId && v.Live).ToList())
        {
            set.Live = false;
            vectorSets.Update(set);
            if (segments.FindById(set.SegmentId) is { } segment)
            {
                segment.LiveBytes -= set.Length;
                segment.LiveRecordCount--;
                segments.Update(segment);
            }
        }

        var record = encoders.FindById(encoderId) ?? new EncoderRecord { Id = encoderId, Name = "unknown", FirstUsedUtc = nowUtc };
        record.Retired = true;
        record.RetiredUtc = nowUtc;
        encoders.Upsert(record);
    }

    private HashSet<string> RetiredEncoderIds() =>
        encoders.Query().Where(e => e.Retired).Select(e => e.Id).ToEnumerable().ToHashSet(StringComparer.Ordinal);
}
