using LiteDB;

namespace IndexKeeper.Core.Catalog;

/// <summary>
/// The catalog of one index directory (LiteDB; schema in docs/catalog.md). It is the source of truth
/// for what is live. REQUIRES: the caller holds the index's <see cref="IndexLock"/> for the catalog's lifetime.
/// </summary>
public sealed partial class IndexCatalog : IDisposable
{
    private readonly LiteDatabase database;
    private readonly ILiteCollection<DocumentRecord> documents;
    private readonly ILiteCollection<PageRecord> pages;
    private readonly ILiteCollection<QueueRecord> queue;
    private readonly ILiteCollection<ScanRecord> scans;
    private readonly ILiteCollection<EncoderRecord> encoders;
    private readonly ILiteCollection<SegmentRecord> segments;
    private readonly ILiteCollection<VectorSetRecord> vectorSets;

    private IndexCatalog(LiteDatabase database)
    {
        this.database = database;
        documents = database.GetCollection<DocumentRecord>(CatalogSchema.Documents);
        pages = database.GetCollection<PageRecord>(CatalogSchema.Pages);
        queue = database.GetCollection<QueueRecord>(CatalogSchema.Queue);
        scans = database.GetCollection<ScanRecord>(CatalogSchema.Scans);
        encoders = database.GetCollection<EncoderRecord>(CatalogSchema.Encoders);
        segments = database.GetCollection<SegmentRecord>(CatalogSchema.Segments);
        vectorSets = database.GetCollection<VectorSetRecord>(CatalogSchema.VectorSets);
    }

    /// <summary>Opens or creates the catalog in the locked directory; refuses a newer schema without writing.</summary>
    public static IndexCatalog Open(IndexLock heldLock)
    {
        ArgumentNullException.ThrowIfNull(heldLock);
        var path = Path.Combine(heldLock.Directory, CatalogSchema.FileName);
        var mapper = new BsonMapper { EnumAsInteger = true };
        var database = new LiteDatabase(new ConnectionString { Filename = path, Connection = ConnectionType.Direct }, mapper);
        try
        {
            CheckSchema(database, path);
            var catalog = new IndexCatalog(database);
            catalog.documents.EnsureIndex(d => d.FileHash);
            catalog.documents.EnsureIndex(d => d.Root);
            catalog.queue.EnsureIndex(q => q.Priority);
            catalog.pages.EnsureIndex(p => p.References);
            catalog.documents.EnsureIndex("pageKeys", "$.PageKeys[*]");
            catalog.vectorSets.EnsureIndex(v => v.PageKey);
            catalog.vectorSets.EnsureIndex(v => v.SegmentId);
            catalog.vectorSets.EnsureIndex(v => v.EncoderId);

            // Every collection exists from the open on, before the daemon's HTTP threads read: LiteDB 5.0.21
            // fails a read that races the transaction creating its collection ("page type must be collection
            // page", LiteDB issue #2792). These indexes create the last three and serve their lookups.
            catalog.segments.EnsureIndex(s => s.EncoderId);
            catalog.encoders.EnsureIndex(e => e.Name);
            catalog.scans.EnsureIndex(s => s.Command);
            return catalog;
        }
        catch
        {
            database.Dispose();
            throw;
        }
    }

    public DocumentRecord? FindDocument(string root, string path) => documents.FindById(DocumentRecord.MakeId(root, path));

    /// <summary>Live documents whose bytes hash to <paramref name="fileHash"/>: a new path with one of these is a copy.</summary>
    public IReadOnlyList<DocumentRecord> FindLiveByFileHash(string fileHash) =>
        documents.Find(d => d.FileHash == fileHash && d.State == DocumentState.Live).ToList();

    public IEnumerable<DocumentRecord> DocumentsOfRoot(string root) => documents.Find(d => d.Root == root);

    public IEnumerable<DocumentRecord> QuarantinedDocuments() => documents.Find(d => d.State == DocumentState.Quarantined);

    public PageRecord? FindPage(string pageKey) => pages.FindById(pageKey);

    public IEnumerable<DocumentRecord> AllDocuments() => documents.FindAll();

    public IEnumerable<PageRecord> AllPages() => pages.FindAll();

    public IEnumerable<string> RootNames() => documents.Query().Select(d => d.Root).ToEnumerable().Distinct(StringComparer.Ordinal);

    public IEnumerable<QueueRecord> QueueInOrder() => queue.Query().OrderBy(q => q.Priority).ToEnumerable();

    /// <summary>Up to <paramref name="count"/> queued pages that may be tried now, highest priority first.</summary>
    public IReadOnlyList<QueueRecord> NextQueued(int count, DateTime nowUtc) =>
        queue.Query().Where(q => q.NotBeforeUtc <= nowUtc).OrderBy(q => q.Priority).Limit(count).ToList();

    /// <summary>Queued pages by priority, quarantined pages apart (they wait for their document to change).</summary>
    public IReadOnlyDictionary<QueuePriority, long> QueueDepths()
    {
        return Enum.GetValues<QueuePriority>().ToDictionary(p => p, p => queue.LongCount(q => q.Priority == p && q.QuarantinedUtc == null));
    }

    /// <summary>Pages quarantined after repeated encoder failures, with their last error.</summary>
    public IReadOnlyList<QueueRecord> QuarantinedPages() => queue.Find(q => q.QuarantinedUtc != null).ToList();

    /// <summary>Applies every change of <paramref name="edit"/> in one transaction.</summary>
    public void Apply(CatalogEdit edit)
    {
        ArgumentNullException.ThrowIfNull(edit);
        if (edit.IsEmpty)
        {
            return;
        }

        database.BeginTrans();
        try
        {
            foreach (var id in edit.DeleteDocuments)
            {
                documents.Delete(id);
            }

            documents.Upsert(edit.PutDocuments);
            pages.Upsert(edit.AddPages);
            foreach (var page in edit.AddPages)
            {
                // A page key back within the life of its old vectors (a restored file) costs no encoder call.
                SetVectorSetsLive(page.Id, live: true);
            }

            foreach (var (key, references) in edit.SetReferences)
            {
                if (pages.FindById(key) is { } page)
                {
                    page.References = references;
                    pages.Update(page);
                }
            }

            queue.Upsert(edit.Enqueue);
            database.Commit();
        }
        catch
        {
            database.Rollback();
            throw;
        }
    }

    /// <summary>Removes pages no live document holds, with their queue entries; returns how many.</summary>
    public int RemoveUnreferencedPages()
    {
        database.BeginTrans();
        try
        {
            var keys = pages.Find(p => p.References <= 0).Select(p => p.Id).ToList();
            foreach (var key in keys)
            {
                pages.Delete(key);
                queue.Delete(key);
                SetVectorSetsLive(key, live: false);
            }

            database.Commit();
            return keys.Count;
        }
        catch
        {
            database.Rollback();
            throw;
        }
    }

    public void AddScan(ScanRecord scan) => scans.Insert(scan);

    public CatalogFigures Figures()
    {
        var live = documents.Count(d => d.State == DocumentState.Live);
        var quarantined = documents.Count(d => d.State == DocumentState.Quarantined);
        var locations = pages.Query().Select(p => p.References).ToEnumerable().Sum(r => (long)r);
        return new CatalogFigures(live, quarantined, pages.LongCount(p => p.References > 0), locations, queue.LongCount(), LastScanUtc());
    }

    public void Dispose() => database.Dispose();

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
    }
}
