using IndexKeeper.Core.Detect;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Faults;
using IndexKeeper.Core.Queue;
using IndexKeeper.Core.Storage;
using LiteDB;

namespace IndexKeeper.Core.Catalog;

/// <summary>
/// The catalog of one index directory (LiteDB; schema in docs/catalog.md), the source of truth for what is
/// live. Each concept is a table of its own (<see cref="Documents"/>, <see cref="Pages"/>, <see cref="Queue"/>,
/// <see cref="Encoders"/>, <see cref="Segments"/>, <see cref="VectorSets"/>, <see cref="History"/>); the
/// changes that span tables are here, each one transaction.
/// REQUIRES: a writer holds the index's <see cref="IndexLock"/> for the catalog's lifetime, a reader
/// the shared <see cref="ReaderGate"/>.
/// </summary>
public sealed class IndexCatalog : IDisposable
{
    private readonly CatalogStore store;

    private IndexCatalog(LiteDatabase database, string? writerDirectory)
    {
        store = new CatalogStore(database, writerDirectory);
        Documents = new DocumentTable(store);
        Pages = new PageTable(store);
        Queue = new QueueTable(store);
        Encoders = new EncoderTable(store);
        Segments = new SegmentTable(store);
        VectorSets = new VectorSetTable(store);
        History = new HistoryTable(store);
        Counts = new RunningCounts(store, History);
    }

    public DocumentTable Documents { get; }

    public PageTable Pages { get; }

    public QueueTable Queue { get; }

    public EncoderTable Encoders { get; }

    public SegmentTable Segments { get; }

    public VectorSetTable VectorSets { get; }

    public HistoryTable History { get; }

    /// <summary>The figures of <see cref="Figures"/> and more, kept as running counts of this process's writes.</summary>
    public RunningCounts Counts { get; }

    /// <summary>How many committed transactions changed which vector sets are live or where they lie (docs/catalog.md).</summary>
    public long VectorSetGeneration => store.VectorSetGeneration();

    /// <summary>
    /// When the catalog was made (meta <c>schema.createdUtc</c>), in ticks; 0 when unknown. With
    /// <see cref="VectorSetGeneration"/> it names one state of one catalog: a rebuilt catalog counts anew.
    /// </summary>
    public long CreatedTicks => store.Meta.FindById(CatalogSchema.SchemaMetaId) is { } schema && schema["createdUtc"].IsDateTime ? schema["createdUtc"].AsDateTime.ToUniversalTime().Ticks : 0;

    /// <summary>Transactions committed through this instance: a cheap test of "has anything changed since".</summary>
    public long Commits => store.Commits;

    /// <summary>
    /// Raised on the committing thread after each commit that touched vector sets, in commit order. A handler
    /// must be quick (it runs inside the writer's work) and must not write the catalog.
    /// </summary>
    public event Action<VectorSetChanges>? VectorSetsCommitted
    {
        add => store.VectorSetsCommitted += value;
        remove => store.VectorSetsCommitted -= value;
    }

    /// <summary>Opens or creates the catalog in the locked directory; refuses a newer schema without writing.</summary>
    public static IndexCatalog Open(IndexLock heldLock)
    {
        ArgumentNullException.ThrowIfNull(heldLock);
        var path = Path.Combine(heldLock.Directory, CatalogSchema.FileName);
        if (!File.Exists(path))
        {
            CreateWhole(heldLock.Directory, path);
        }

        return OpenWritable(path, heldLock.Directory);
    }

    /// <summary>
    /// Makes a new catalog whole (schema record, every collection and index, log folded) under a temporary
    /// name and renames it in, then fsyncs the directory: a reader opening beside the first sync sees either
    /// no catalog or a complete one, never a file LiteDB is half-way through creating. A leftover of a
    /// creation that crashed before its rename holds only that empty schema, so it is replaced.
    /// </summary>
    private static void CreateWhole(string directory, string path)
    {
        var creating = Path.Combine(directory, CatalogSchema.CreatingFileName);
        var creatingLog = Path.Combine(directory, Path.GetFileNameWithoutExtension(creating) + "-log" + Path.GetExtension(creating));
        File.Delete(creating);
        File.Delete(creatingLog);
        using (var catalog = OpenWritable(creating, writerDirectory: null))
        {
            catalog.store.Database.Checkpoint();
        }

        File.Delete(creatingLog);
        FaultInjection.Reach(FaultPoints.CatalogCreateRename);
        File.Move(creating, path);
        DirectorySync.Flush(directory);
    }

    private static IndexCatalog OpenWritable(string path, string? writerDirectory)
    {
        var database = Damaged(path, () => new LiteDatabase(new ConnectionString { Filename = path, Connection = ConnectionType.Direct }, Mapper()));
        try
        {
            Damaged(path, () => CheckSchema(database, path));

            // Readers in other processes read the log as it was when they opened; LiteDB's own checkpoint
            // would rewrite it under them, so the writer folds it only when no reader is open (CatalogStore).
            if (database.CheckpointSize != 0)
            {
                database.CheckpointSize = 0;
            }

            var catalog = new IndexCatalog(database, writerDirectory);
            var s = catalog.store;
            s.Documents.EnsureIndex(d => d.FileHash);
            s.Documents.EnsureIndex(d => d.Root);
            s.Queue.EnsureIndex(q => q.Priority);
            s.Pages.EnsureIndex(p => p.References);
            s.Documents.EnsureIndex("pageKeys", "$.PageKeys[*]");
            s.VectorSets.EnsureIndex(v => v.PageKey);
            s.VectorSets.EnsureIndex(v => v.SegmentId);
            s.VectorSets.EnsureIndex(v => v.EncoderId);

            // Every collection exists from the open on, before the daemon's HTTP threads read: LiteDB 5.0.21
            // fails a read that races the transaction creating its collection ("page type must be collection
            // page", LiteDB issue #2792). These indexes create the last three and serve their lookups.
            s.Segments.EnsureIndex(x => x.EncoderId);
            s.Encoders.EnsureIndex(e => e.Name);
            s.Scans.EnsureIndex(x => x.Command);
            return catalog;
        }
        catch
        {
            database.Dispose();
            throw;
        }
    }

    /// <summary>
    /// Opens the catalog for reading only: no schema record, no index, no checkpoint is written, so the
    /// file's bytes stay as they are. It sees the transactions committed before the open, never one a writer
    /// is half-way through (LiteDB reads only confirmed transactions of its log). A directory without a
    /// catalog reads as an empty one (in memory).
    /// REQUIRES: the caller holds <paramref name="heldGate"/> for the catalog's lifetime.
    /// </summary>
    public static IndexCatalog OpenReadOnly(ReaderGate heldGate)
    {
        ArgumentNullException.ThrowIfNull(heldGate);
        var path = Path.Combine(heldGate.Directory, CatalogSchema.FileName);
        if (!File.Exists(path))
        {
            return new IndexCatalog(new LiteDatabase(new MemoryStream(), Mapper()), writerDirectory: null);
        }

        var database = Damaged(path, () => new LiteDatabase(new ConnectionString { Filename = path, Connection = ConnectionType.Direct, ReadOnly = true }, Mapper()));
        try
        {
            var schema = Damaged(path, () => database.GetCollection(CatalogSchema.Meta).FindById(CatalogSchema.SchemaMetaId));
            var version = schema?["version"].AsInt32 ?? 0;
            if (version is < 1 or > CatalogSchema.Version)
            {
                throw new CatalogVersionException(
                    $"The catalog '{path}' has schema version {version}; this build reads versions 1 to {CatalogSchema.Version}. Nothing was changed.");
            }

            return new IndexCatalog(database, writerDirectory: null);
        }
        catch
        {
            database.Dispose();
            throw;
        }
    }

    /// <summary>Applies every change of <paramref name="edit"/> in one transaction.</summary>
    public void Apply(CatalogEdit edit)
    {
        ArgumentNullException.ThrowIfNull(edit);
        if (edit.IsEmpty)
        {
            return;
        }

        store.InTransaction(() =>
        {
            foreach (var id in edit.DeleteDocuments)
            {
                store.Documents.Delete(id);
                store.Marks.Document(id);
            }

            store.Documents.Upsert(edit.PutDocuments);
            foreach (var document in edit.PutDocuments)
            {
                store.Marks.Document(document.Id);
            }

            store.Pages.Upsert(edit.AddPages);
            foreach (var page in edit.AddPages)
            {
                store.Marks.Page(page.Id);
                // A page key back within the life of its old vectors (a restored file) costs no encoder call.
                SetVectorSetsLive(page.Id, live: true);
            }

            foreach (var (key, references) in edit.SetReferences)
            {
                store.Marks.Page(key);
                if (store.Pages.FindById(key) is { } page)
                {
                    page.References = references;
                    store.Pages.Update(page);
                }
            }

            store.Queue.Upsert(edit.Enqueue);
            foreach (var entry in edit.Enqueue)
            {
                store.Marks.Queued(entry.Id);
            }
        });
    }

    /// <summary>Removes pages no live document holds, with their queue entries; returns how many.</summary>
    public int RemoveUnreferencedPages() => store.InTransaction(() =>
    {
        var keys = store.Pages.Find(p => p.References <= 0).Select(p => p.Id).ToList();
        foreach (var key in keys)
        {
            store.Pages.Delete(key);
            store.Queue.Delete(key);
            store.Marks.Page(key);
            store.Marks.Queued(key);
            SetVectorSetsLive(key, live: false);
        }

        return keys.Count;
    });

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
        store.InTransaction(() =>
        {
            var references = Pages.ReferencesOf(added.Select(s => s.PageKey));
            foreach (var set in added)
            {
                // A key whose last page location went away while it was being encoded is born dead.
                set.Live = references.GetValueOrDefault(set.PageKey) > 0;
                segment.RecordCount++;
                if (set.Live)
                {
                    segment.LiveBytes += set.Length;
                    segment.LiveRecordCount++;
                }
            }

            store.Segments.Upsert(segment);
            store.VectorSets.Upsert(added);
            foreach (var set in added)
            {
                store.Touch(set);
            }

            ByKeys.Delete(store.Queue, dequeued);
            foreach (var key in dequeued)
            {
                store.Marks.Queued(key);
            }
        });
    }

    /// <summary>
    /// Swaps compaction outputs in at once: the moved vector sets point into the new segments, dead vector
    /// sets of the old segments are forgotten, the old segments leave the catalog and are listed as retired
    /// (<see cref="SegmentTable.RetiredIds"/>). The old files may be deleted only after this commit.
    /// </summary>
    public void SwapCompacted(IReadOnlyList<long> oldSegmentIds, IReadOnlyList<SegmentRecord> newSegments, IReadOnlyDictionary<(long SegmentId, long Offset), (long SegmentId, long Offset)> moves)
    {
        ArgumentNullException.ThrowIfNull(oldSegmentIds);
        ArgumentNullException.ThrowIfNull(newSegments);
        ArgumentNullException.ThrowIfNull(moves);
        store.InTransaction(() =>
        {
            foreach (var oldId in oldSegmentIds)
            {
                foreach (var set in store.VectorSets.Find(v => v.SegmentId == oldId).ToList())
                {
                    if (set.Live && moves.TryGetValue((set.SegmentId, set.Offset), out var to))
                    {
                        set.SegmentId = to.SegmentId;
                        set.Offset = to.Offset;
                        store.VectorSets.Update(set);
                        store.Touch(set);
                    }
                    else if (set.Live)
                    {
                        throw new InvalidOperationException($"compaction lost the live vector set {set.Id}; nothing was swapped.");
                    }
                    else
                    {
                        // Not live, so no search saw it (no generation moves); only the running record count does.
                        store.VectorSets.Delete(set.Id);
                        store.Marks.VectorSet(set);
                    }
                }

                store.Segments.Delete(oldId);
            }

            Segments.AddRetired(oldSegmentIds);
            store.Segments.Upsert(newSegments);
        });
    }

    /// <summary>
    /// Points the words of the pages in <paramref name="moves"/> (page key → new location) at a rewritten
    /// page-word file, in one transaction; refuses (nothing changes) when a page still names
    /// <paramref name="oldFile"/> without a move. The old file may be deleted only after this commit.
    /// </summary>
    public void MovePageWords(long oldFile, IReadOnlyDictionary<string, WordsAtRecord> moves)
    {
        ArgumentNullException.ThrowIfNull(moves);
        store.InTransaction(() =>
        {
            foreach (var (key, _) in Pages.WordLocations().Where(p => p.At.File == oldFile).ToList())
            {
                if (!moves.TryGetValue(key, out var to) || store.Pages.FindById(key) is not { } page)
                {
                    throw new InvalidOperationException($"word compaction lost the words of page {key}; nothing was moved.");
                }

                page.WordsAt = to;
                store.Pages.Update(page);
            }
        });
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
        return store.InTransaction(() =>
        {
            var requeued = 0;
            foreach (var set in lost)
            {
                store.VectorSets.Delete(set.Id);
                store.Touch(new VectorSetRecord { Id = set.Id, EncoderId = set.EncoderId, PageKey = set.PageKey, SegmentId = set.SegmentId, Offset = set.Offset, Length = set.Length, Checksum = set.Checksum, VectorCount = set.VectorCount, Live = false });
                if (store.Segments.FindById(set.SegmentId) is { } segment)
                {
                    segment.RecordCount--;
                    if (set.Live)
                    {
                        segment.LiveRecordCount--;
                        segment.LiveBytes -= set.Length;
                    }

                    store.Segments.Update(segment);
                }

                if (set.Live && Pages.ReferencesOf(set.PageKey) > 0)
                {
                    store.Queue.Upsert(new QueueRecord { Id = set.PageKey, Priority = QueuePriority.Fresh, EnqueuedUtc = now, NotBeforeUtc = now });
                    store.Marks.Queued(set.PageKey);
                    requeued++;
                }
            }

            foreach (var id in dropSegments)
            {
                store.Segments.Delete(id);
            }

            return requeued;
        });
    }

    /// <summary>
    /// Applies one step of drift tracking in one transaction: page keys queued at migration priority,
    /// encoders retired (their live vector sets made dead, segment counts with them, so compaction reclaims
    /// the bytes), and the serving encoder recorded when <paramref name="servingEncoderId"/> is given. A
    /// switch-over is therefore atomic: before the commit searches use the old vectors, after it the new.
    /// </summary>
    public void ApplyDrift(IReadOnlyCollection<string> queueForMigration, IReadOnlyCollection<string> retireEncoders, string? servingEncoderId, DateTime nowUtc)
    {
        ArgumentNullException.ThrowIfNull(queueForMigration);
        ArgumentNullException.ThrowIfNull(retireEncoders);
        if (queueForMigration.Count == 0 && retireEncoders.Count == 0 && servingEncoderId is null)
        {
            return;
        }

        store.InTransaction(() =>
        {
            store.Queue.Upsert(queueForMigration.Select(key => new QueueRecord
            {
                Id = key,
                Priority = QueuePriority.Migration,
                EnqueuedUtc = nowUtc,
                NotBeforeUtc = nowUtc,
            }));
            foreach (var key in queueForMigration)
            {
                store.Marks.Queued(key);
            }

            foreach (var encoderId in retireEncoders)
            {
                Retire(encoderId, nowUtc);
            }

            if (servingEncoderId is not null)
            {
                store.Meta.Upsert(new BsonDocument
                {
                    ["_id"] = CatalogSchema.ServingEncoderMetaId,
                    ["encoderId"] = servingEncoderId,
                    ["sinceUtc"] = nowUtc,
                });
            }
        });
    }

    public CatalogFigures Figures()
    {
        var live = store.Documents.Count(d => d.State == DocumentState.Live);
        var quarantined = store.Documents.Count(d => d.State == DocumentState.Quarantined);
        // A file named as a readable type whose bytes no reader takes is suspect (a damaged copy) and stays a
        // fault; one of another type that an include glob selected is merely not indexable.
        var unsupported = store.Documents.Find(d => d.State == DocumentState.Quarantined && d.QuarantineReason == QuarantineReason.Unsupported)
            .LongCount(d => !ReadableTypes.IsReadable(d.Path));
        var locations = store.Pages.Query().Select(p => p.References).ToEnumerable().Sum(r => (long)r);
        return new CatalogFigures(live, quarantined - unsupported, unsupported, store.Pages.LongCount(p => p.References > 0), locations, store.Queue.LongCount(), History.LastScanUtc());
    }

    public void Dispose() => store.Dispose();

    private static BsonMapper Mapper() => new() { EnumAsInteger = true };

    /// <summary>
    /// Opens or reads the file, turning any complaint of LiteDB about bytes it cannot parse into an error that
    /// names the file and the way back (docs/recovery.md) instead of a stack trace. Nothing is repaired here.
    /// </summary>
    private static T Damaged<T>(string path, Func<T> open)
    {
        try
        {
            return open();
        }
        catch (Exception ex) when (ex is not (IOException or UnauthorizedAccessException or OutOfMemoryException or CatalogVersionException))
        {
            // LiteDB reports bytes it cannot parse in many ways (its own exception, a date out of range, a bad
            // cast); at open every one of them means the file is not a readable catalog.
            throw new CatalogDamagedException(
                $"The catalog '{path}' cannot be read ({ex.Message}). Nothing was changed. Keep a copy of it, then restore it from a backup or rebuild it from the segments and the roots (docs/recovery.md).",
                ex);
        }
    }

    private static void Damaged(string path, Action read) => Damaged(path, () =>
    {
        read();
        return true;
    });

    /// <summary>REQUIRES: inside a transaction of the caller.</summary>
    private void Retire(string encoderId, DateTime nowUtc)
    {
        foreach (var set in store.VectorSets.Find(v => v.EncoderId == encoderId && v.Live).ToList())
        {
            set.Live = false;
            store.VectorSets.Update(set);
            store.Touch(set);
            AdjustLive(set, -1);
        }

        var record = store.Encoders.FindById(encoderId) ?? new EncoderRecord { Id = encoderId, Name = "unknown", FirstUsedUtc = nowUtc };
        record.Retired = true;
        record.RetiredUtc = nowUtc;
        store.Encoders.Upsert(record);
    }

    /// <summary>REQUIRES: inside a transaction of the caller.</summary>
    private void SetVectorSetsLive(string pageKey, bool live)
    {
        HashSet<string>? retired = null;
        foreach (var set in store.VectorSets.Find(v => v.PageKey == pageKey && v.Live != live).ToList())
        {
            // A restored page brings back only vectors of encoders still in use; a retired encoder's stay dead.
            retired ??= live ? Encoders.RetiredIds() : [];
            if ((live && retired.Contains(set.EncoderId)) || !AdjustLive(set, live ? 1 : -1))
            {
                continue;
            }

            set.Live = live;
            store.VectorSets.Update(set);
            store.Touch(set);
        }
    }

    /// <summary>Moves a vector set's bytes into or out of its segment's live counts; false when the segment is unknown.</summary>
    private bool AdjustLive(VectorSetRecord set, int sign)
    {
        if (store.Segments.FindById(set.SegmentId) is not { } segment)
        {
            return false;
        }

        segment.LiveBytes += sign * set.Length;
        segment.LiveRecordCount += sign;
        store.Segments.Update(segment);
        return true;
    }

    private static void CheckSchema(LiteDatabase database, string path)
    {
        var meta = database.GetCollection(CatalogSchema.Meta);
        var schema = meta.FindById(CatalogSchema.SchemaMetaId);
        if (schema is null)
        {
            if (database.GetCollectionNames().Any(n => n != CatalogSchema.Meta))
            {
                throw new CatalogVersionException($"'{path}' holds data but no IndexKeeper schema record; it is not a catalog of this tool. Nothing was changed.");
            }

            meta.Insert(new BsonDocument
            {
                ["_id"] = CatalogSchema.SchemaMetaId,
                ["version"] = CatalogSchema.Version,
                ["createdUtc"] = DateTime.UtcNow,
            });
            return;
        }

        var version = schema["version"].AsInt32;
        if (version > CatalogSchema.Version)
        {
            throw new CatalogVersionException(
                $"The catalog '{path}' has schema version {version}; this build reads up to version {CatalogSchema.Version}. Use a newer IndexKeeper. Nothing was changed.");
        }

        if (version < 1)
        {
            throw new CatalogVersionException($"The catalog '{path}' has an invalid schema version {version}. Nothing was changed.");
        }

        if (version == 1)
        {
            // Version 1 → 2: page words of records written so far stay inside them and are read there;
            // pages added from now on keep theirs in the page-word store.
            schema["version"] = CatalogSchema.Version;
            meta.Update(schema);
        }
    }
}
