using IndexKeeper.Core.Faults;
using LiteDB;

namespace IndexKeeper.Core.Catalog;

/// <summary>
/// The open LiteDB database of a catalog and its collections, shared by the per-concept tables, with the
/// one transaction helper every change that spans records uses.
/// </summary>
/// <param name="writerDirectory">
/// The index directory when this process is the writer: LiteDB's automatic checkpoint is off, and the log is
/// folded into the data file here only while <see cref="ReaderGate"/> is held exclusively (docs/catalog.md,
/// "Readers beside a writer"). Null for a reader.
/// </param>
internal sealed class CatalogStore(LiteDatabase database, string? writerDirectory) : IDisposable
{
    /// <summary>LiteDB's own default threshold (1000 pages of 8 KiB; LiteDB's documentation of the Checkpoint pragma).</summary>
    private const long CheckpointLogBytes = 1000L * 8192;

    public LiteDatabase Database { get; } = database;

    public ILiteCollection<BsonDocument> Meta { get; } = database.GetCollection(CatalogSchema.Meta);

    public ILiteCollection<DocumentRecord> Documents { get; } = database.GetCollection<DocumentRecord>(CatalogSchema.Documents);

    public ILiteCollection<PageRecord> Pages { get; } = database.GetCollection<PageRecord>(CatalogSchema.Pages);

    // The same records unmapped: a field or two of one page by its key, without the mapper building a PageRecord or a
    // query translating and parsing an expression per call (with a work queue, three such reads a committed page were
    // a third of the coordinator's catalog time; docs/benchmarks.md, workqueue run 12).
    private readonly ILiteCollection<BsonDocument> pageDocuments = database.GetCollection(CatalogSchema.Pages);

    /// <summary>One page's record as stored (field names as <see cref="PageRecord"/>'s properties, its key as <c>_id</c>); null when it has none.</summary>
    public BsonDocument? PageDocument(string pageKey) => pageDocuments.FindById(pageKey);

    /// <summary>Pages' records as stored, by key (<see cref="ByKeys"/>); a key without a record is absent.</summary>
    public Dictionary<string, BsonDocument> PageDocuments(IEnumerable<string> pageKeys) => ByKeys.Find(pageDocuments, pageKeys, d => d["_id"].AsString);

    /// <summary>A page's reference count; 0 when it has no record.</summary>
    public int PageReferences(string pageKey) => References(PageDocument(pageKey));

    /// <summary>A page record's reference count as stored; 0 for none.</summary>
    public static int References(BsonDocument? page) => page?[nameof(PageRecord.References)].AsInt32 ?? 0;

    public ILiteCollection<QueueRecord> Queue { get; } = database.GetCollection<QueueRecord>(CatalogSchema.Queue);

    public ILiteCollection<ScanRecord> Scans { get; } = database.GetCollection<ScanRecord>(CatalogSchema.Scans);

    public ILiteCollection<EncoderRecord> Encoders { get; } = database.GetCollection<EncoderRecord>(CatalogSchema.Encoders);

    public ILiteCollection<SegmentRecord> Segments { get; } = database.GetCollection<SegmentRecord>(CatalogSchema.Segments);

    public ILiteCollection<VectorSetRecord> VectorSets { get; } = database.GetCollection<VectorSetRecord>(CatalogSchema.VectorSets);

    /// <summary>
    /// Vector sets whose liveness or location a change of the running transaction touched (their state after
    /// it); empty outside a transaction. Read by <see cref="InTransaction{T}"/> to count the generation.
    /// </summary>
    private readonly List<VectorSetRecord> touched = [];

    /// <summary>Keys the writes of this process touched, for <see cref="RunningCounts"/>.</summary>
    public CatalogMarks Marks { get; } = new();

    /// <summary>
    /// Held by every transaction from its start to its end and by <see cref="RunningCounts"/> while it reads: the
    /// counts then never take a transaction's marks before its records are committed (they would re-read the
    /// records as they were and lose the change), whichever thread asks (the writer's loop or <c>/api/status</c>).
    /// </summary>
    public object CountsGate { get; } = new();

    /// <summary>Commits since the catalog was opened in this process (any change, transactions only).</summary>
    public long Commits { get; private set; }

    /// <summary>Called after a commit that touched vector sets, with the new generation and what changed.</summary>
    public Action<VectorSetChanges>? VectorSetsCommitted { get; set; }

    /// <summary>
    /// The vector-set generation: how many committed transactions changed which vector sets are live or where
    /// they lie (meta <c>vectorSetGeneration</c>, docs/catalog.md). 0 for a catalog that never counted.
    /// </summary>
    public long VectorSetGeneration() =>
        Meta.FindById(CatalogSchema.VectorSetGenerationMetaId) is { } generation ? generation["value"].AsInt64 : 0;

    /// <summary>REQUIRES: inside a transaction. Records a vector set as the transaction leaves it (deleted = not live).</summary>
    public void Touch(VectorSetRecord set)
    {
        touched.Add(set);
        Marks.VectorSet(set);
    }

    /// <summary>Runs <paramref name="change"/> as one transaction: all of it is committed, or none (rolled back on any exception).</summary>
    public void InTransaction(Action change) => InTransaction(() =>
    {
        change();
        return true;
    });

    /// <inheritdoc cref="InTransaction(Action)"/>
    public T InTransaction<T>(Func<T> change)
    {
        ArgumentNullException.ThrowIfNull(change);
        lock (CountsGate)
        {
            return Transaction(change);
        }
    }

    private T Transaction<T>(Func<T> change)
    {
        Database.BeginTrans();
        touched.Clear();
        VectorSetChanges? changes = null;
        try
        {
            var result = change();
            if (touched.Count > 0)
            {
                // Counted inside the transaction, so a serving view stamped with a generation names exactly one state.
                var generation = VectorSetGeneration() + 1;
                Meta.Upsert(new BsonDocument { ["_id"] = CatalogSchema.VectorSetGenerationMetaId, ["value"] = generation });
                changes = new VectorSetChanges(generation, [.. touched]);
            }

            FaultInjection.Reach(FaultPoints.CatalogCommitBefore);
            Database.Commit();
            Commits++;
            FaultInjection.Reach(FaultPoints.CatalogCommitAfter);
            CheckpointIfNoReader(CheckpointLogBytes);
            if (changes is not null)
            {
                VectorSetsCommitted?.Invoke(changes);
            }

            return result;
        }
        catch
        {
            Database.Rollback();
            throw;
        }
        finally
        {
            touched.Clear();
        }
    }

    public void Dispose()
    {
        // Fold the whole log at the end when no reader is open; else it stays for a later writer.
        CheckpointIfNoReader(1);
        Database.Dispose();
    }

    /// <summary>Folds the log into the data file when it holds at least <paramref name="logBytes"/> and no reader is open.</summary>
    private void CheckpointIfNoReader(long logBytes)
    {
        if (writerDirectory is null)
        {
            return;
        }

        var log = new FileInfo(Path.Combine(writerDirectory, CatalogSchema.LogFileName));
        if (!log.Exists || log.Length < logBytes)
        {
            return;
        }

        using var gate = ReaderGate.TryEnterExclusive(writerDirectory);
        if (gate is null)
        {
            return;
        }

        try
        {
            // LiteDB refuses every call once a write has failed (it keeps that error); its checkpoint would
            // then wait a minute for a lock the failed transaction holds. A read finds that out at once.
            _ = Meta.FindById(CatalogSchema.SchemaMetaId);
            Database.Checkpoint();
        }
        catch (Exception ex) when (ex is IOException or LiteException)
        {
            // A full or failing disk: the log keeps every committed transaction (LiteDB reads it at the next
            // open) and the next commit or close tries again; the commit that came before stays committed.
        }
    }
}
