using IndexKeeper.Core.Scheduling;
using LiteDB;

namespace IndexKeeper.Core.Catalog;

/// <summary>Read-only access for the plan, and the embed history it estimates throughput from.</summary>
public sealed partial class IndexCatalog
{
    /// <summary>The <see cref="ScanRecord.Command"/> of an embed record. Reaches the catalog: never change it.</summary>
    public const string EmbedCommand = "embed";

    /// <summary>
    /// Opens the catalog for reading only: no schema record, no index, no checkpoint is written, so the
    /// file's bytes stay as they are. A directory without a catalog reads as an empty one (in memory).
    /// REQUIRES: the caller holds the index lock (no writer can be half-way through a transaction).
    /// </summary>
    public static IndexCatalog OpenReadOnly(IndexLock heldLock)
    {
        ArgumentNullException.ThrowIfNull(heldLock);
        var path = Path.Combine(heldLock.Directory, CatalogSchema.FileName);
        var mapper = new BsonMapper { EnumAsInteger = true };
        if (!File.Exists(path))
        {
            return new IndexCatalog(new LiteDatabase(new MemoryStream(), mapper));
        }

        var database = new LiteDatabase(new ConnectionString { Filename = path, Connection = ConnectionType.Direct, ReadOnly = true }, mapper);
        try
        {
            var schema = database.GetCollection(CatalogSchema.Meta).FindById(CatalogSchema.SchemaMetaId);
            var version = schema?["version"].AsInt32 ?? 0;
            if (version is < 1 or > CatalogSchema.Version)
            {
                throw new CatalogVersionException(
                    $"The catalog '{path}' has schema version {version}; this build reads versions 1 to {CatalogSchema.Version}. Nothing was changed.");
            }

            return new IndexCatalog(database);
        }
        catch
        {
            database.Dispose();
            throw;
        }
    }

    /// <summary>Queued page keys with their priority.</summary>
    public IReadOnlyList<(string PageKey, QueuePriority Priority)> QueuedKeys() =>
        queue.FindAll().Select(q => (q.Id, q.Priority)).ToList();

    /// <summary>Queued pages by priority that may be tried at <paramref name="nowUtc"/> (past their back-off): what the gate is asked about.</summary>
    public QueuedPages DueQueued(DateTime nowUtc) => new(
        queue.LongCount(q => q.Priority == QueuePriority.Fresh && q.NotBeforeUtc <= nowUtc),
        queue.LongCount(q => q.Priority == QueuePriority.Migration && q.NotBeforeUtc <= nowUtc),
        queue.LongCount(q => q.Priority == QueuePriority.Canary && q.NotBeforeUtc <= nowUtc));

    /// <summary>Up to <paramref name="count"/> due queued pages of the priorities a gate decision allows, highest first.</summary>
    public IReadOnlyList<QueueRecord> NextQueued(int count, DateTime nowUtc, IReadOnlyCollection<QueuePriority> allowed)
    {
        ArgumentNullException.ThrowIfNull(allowed);
        if (allowed.Count == 0)
        {
            return [];
        }

        // The gate allows a prefix of the priorities (fresh; or all), so one bound selects them.
        var lowest = allowed.Max();
        return queue.Query().Where(q => q.NotBeforeUtc <= nowUtc && q.Priority <= lowest).OrderBy(q => q.Priority).Limit(count).ToList();
    }

    /// <summary>Page keys that live documents hold.</summary>
    public IEnumerable<string> ReferencedPageKeys() =>
        pages.Query().Where(p => p.References > 0).Select(p => p.Id).ToEnumerable();

    /// <summary>Page keys no live document holds (left by an interrupted pass; the next pass removes them).</summary>
    public IEnumerable<string> UnreferencedPageKeys() =>
        pages.Query().Where(p => p.References <= 0).Select(p => p.Id).ToEnumerable();

    /// <summary>Vector sets and vectors under one encoder: the measured vectors per page.</summary>
    public (long VectorSets, long Vectors) VectorCounts(string encoderId)
    {
        var counts = vectorSets.Find(v => v.EncoderId == encoderId).Select(v => (long)v.VectorCount).ToList();
        return (counts.Count, counts.Sum());
    }

    /// <summary>Records what one embed run cost under one encoder, for the plan's throughput estimate.</summary>
    public void RecordEmbedding(string encoderId, DateTime startedUtc, double elapsedSeconds, long pagesEmbedded, long vectorsWritten, double encoderSeconds)
    {
        scans.Insert(new ScanRecord
        {
            StartedUtc = startedUtc,
            ElapsedSeconds = elapsedSeconds,
            Command = EmbedCommand,
            EncoderId = encoderId,
            EncoderSeconds = encoderSeconds,
            Counts = new Dictionary<string, long> { ["pagesEmbedded"] = pagesEmbedded, ["vectorsWritten"] = vectorsWritten },
        });
    }

    /// <summary>The latest embed records of one encoder, newest first.</summary>
    public IReadOnlyList<ScanRecord> EmbedHistory(string encoderId, int count) =>
        scans.Query().Where(s => s.Command == EmbedCommand && s.EncoderId == encoderId).OrderByDescending(s => s.Id).Limit(count).ToList();

    /// <summary>When the last scan pass (not an embed record) started.</summary>
    public DateTime? LastScanUtc() =>
        scans.Query().Where(s => s.Command != EmbedCommand).OrderByDescending(s => s.Id).Limit(1).FirstOrDefault()?.StartedUtc.ToUniversalTime();
}
