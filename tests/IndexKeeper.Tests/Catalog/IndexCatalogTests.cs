using System.Security.Cryptography;
using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Documents;
using IndexKeeper.Tests.Support;
using LiteDB;

namespace IndexKeeper.Tests.Catalog;

public sealed class IndexCatalogTests
{
    [Fact]
    public void Second_holder_of_the_lock_is_refused_with_the_holders_process_id()
    {
        using var temp = new TempDirectory();
        using (IndexLock.Acquire(temp.Path, "first"))
        {
            var refused = Assert.Throws<IndexLockedException>(() => IndexLock.Acquire(temp.Path, "second"));
            Assert.Equal(Environment.ProcessId, refused.HolderProcessId);
            Assert.Contains($"process {Environment.ProcessId}", refused.Message, StringComparison.Ordinal);
        }

        using (IndexLock.Acquire(temp.Path, "after release"))
        {
        }
    }

    /// <summary>
    /// A reader thread must never meet a collection being created (LiteDB issue #2792: the read fails with
    /// "page type must be collection page"), so a writable open creates every collection of docs/catalog.md.
    /// </summary>
    [Fact]
    public void A_writable_open_creates_every_collection()
    {
        using var temp = new TempDirectory();
        using (var held = IndexLock.Acquire(temp.Path, "test"))
        using (IndexCatalog.Open(held))
        {
        }

        using var db = new LiteDatabase(new ConnectionString { Filename = Path.Combine(temp.Path, CatalogSchema.FileName), Connection = ConnectionType.Direct });
        string[] expected = [CatalogSchema.Meta, CatalogSchema.Documents, CatalogSchema.Pages, CatalogSchema.Queue, CatalogSchema.Scans, CatalogSchema.Encoders, CatalogSchema.Segments, CatalogSchema.VectorSets];
        Assert.Equal(expected.Order(StringComparer.Ordinal), db.GetCollectionNames().Order(StringComparer.Ordinal));
    }

    [Fact]
    public void Newer_schema_is_refused_and_the_file_is_left_untouched()
    {
        using var temp = new TempDirectory();
        using (var held = IndexLock.Acquire(temp.Path, "test"))
        using (IndexCatalog.Open(held))
        {
        }

        var file = Path.Combine(temp.Path, CatalogSchema.FileName);
        using (var db = new LiteDatabase(new ConnectionString { Filename = file, Connection = ConnectionType.Direct }))
        {
            var meta = db.GetCollection(CatalogSchema.Meta);
            var schema = meta.FindById("schema");
            schema["version"] = CatalogSchema.Version + 1;
            meta.Update(schema);
        }

        var before = SHA256.HashData(File.ReadAllBytes(file));
        using (var held = IndexLock.Acquire(temp.Path, "test"))
        {
            var refused = Assert.Throws<CatalogVersionException>(() => IndexCatalog.Open(held));
            Assert.Contains($"schema version {CatalogSchema.Version + 1}", refused.Message, StringComparison.Ordinal);
        }

        Assert.Equal(before, SHA256.HashData(File.ReadAllBytes(file)));
    }

    [Fact]
    public void Foreign_liteDB_file_is_not_taken_for_a_catalog()
    {
        using var temp = new TempDirectory();
        using (var db = new LiteDatabase(Path.Combine(temp.Path, CatalogSchema.FileName)))
        {
            db.GetCollection("customers").Insert(new BsonDocument { ["name"] = "someone" });
        }

        using var held = IndexLock.Acquire(temp.Path, "test");
        Assert.Throws<CatalogVersionException>(() => IndexCatalog.Open(held));
    }

    [Fact]
    public void Failed_edit_leaves_nothing_behind()
    {
        using var temp = new TempDirectory();
        using var held = IndexLock.Acquire(temp.Path, "test");
        using var catalog = IndexCatalog.Open(held);
        var edit = new CatalogEdit();
        edit.PutDocuments.Add(new DocumentRecord { Id = DocumentRecord.MakeId("r", "a.pdf"), Root = "r", Path = "a.pdf", State = DocumentState.Live });
        edit.AddPages.Add(new PageRecord { Id = "k1", References = 1 });
        edit.AddPages.Add(new PageRecord { Id = "k1", References = 1 });
        edit.Enqueue.Add(new QueueRecord { Id = "k1" });
        edit.Enqueue.Add(null!);
        Assert.ThrowsAny<Exception>(() => catalog.Apply(edit));
        Assert.Null(catalog.Documents.Find("r", "a.pdf"));
        Assert.Null(catalog.Pages.Find("k1"));
    }

    [Fact]
    public void Figures_count_an_unindexable_type_apart_from_the_faults_but_not_a_garbled_readable_one()
    {
        using var temp = new TempDirectory();
        using var held = IndexLock.Acquire(temp.Path, "test");
        using var catalog = IndexCatalog.Open(held);
        var edit = new CatalogEdit();
        foreach (var (path, reason) in new[] { ("exports/readings.zip", QuarantineReason.Unsupported), ("scans/garbled.PDF", QuarantineReason.Unsupported), ("minutes.pdf", QuarantineReason.Encrypted) })
        {
            edit.PutDocuments.Add(new DocumentRecord { Id = DocumentRecord.MakeId("r", path), Root = "r", Path = path, State = DocumentState.Quarantined, QuarantineReason = reason });
        }

        catalog.Apply(edit);
        var figures = catalog.Figures();
        Assert.Equal(1, figures.UnsupportedDocuments);
        Assert.Equal(2, figures.QuarantinedDocuments);
    }
}
