using IndexKeeper.Core.Catalog;
using LiteDB;

namespace IndexKeeper.Tests.EndToEnd;

/// <summary>
/// Page words live in the page-word store, not in the catalog (issue 13), on the real executable: a sync
/// leaves page records with only the words' location, snippets read them there, and an index whose words
/// are still inside its page records (schema version 1) keeps serving them where they are.
/// </summary>
public sealed class PageWordsTests : IDisposable
{
    private const string Line = "Sluice gate seven greased before the thaw";
    private readonly CliIndex index = new("store");

    public void Dispose() => index.Dispose();

    [Fact]
    public void A_sync_keeps_words_out_of_the_catalog_and_snippets_read_them_from_the_store()
    {
        index.Put("store/logs/sluice.pdf", StorePdfs.Document("sluice", 3, 2, Line));
        index.Json("sync");

        using (var database = OpenCatalog())
        {
            var pages = database.GetCollection(CatalogSchema.Pages).FindAll().ToList();
            Assert.NotEmpty(pages);
            Assert.All(pages, p => Assert.True(!p.ContainsKey("Words") || p["Words"].AsArray.Count == 0, p["_id"].AsString));
            Assert.All(pages, p => Assert.True(p["WordsAt"].IsDocument, p["_id"].AsString));
            Assert.Equal(CatalogSchema.Version, database.GetCollection(CatalogSchema.Meta).FindById("schema")["version"].AsInt32);
        }

        Assert.Contains("«thaw»", Snippet("thaw sluice"), StringComparison.Ordinal);
        Assert.Equal(0, index.Run("verify").ExitCode);
    }

    [Fact]
    public void Words_inside_a_schema_1_page_record_are_still_read_and_a_writer_keeps_them_there()
    {
        index.Put("store/logs/sluice.pdf", StorePdfs.Document("sluice", 3, 2, Line));
        index.Json("sync");

        // As a version-1 catalog holds them: words inside the record, no location, schema version 1; the
        // store's files are gone, so only the record can answer.
        using (var database = OpenCatalog())
        {
            var pages = database.GetCollection(CatalogSchema.Pages);
            foreach (var page in pages.FindAll().ToList())
            {
                var words = page["WordsAt"].IsDocument ? ReadBack(page["_id"].AsString, page["WordsAt"].AsDocument) : [];
                page["Words"] = new BsonArray(words);
                page.Remove("WordsAt");
                pages.Update(page);
            }

            var meta = database.GetCollection(CatalogSchema.Meta);
            var schema = meta.FindById("schema");
            schema["version"] = 1;
            meta.Update(schema);
        }

        Directory.Delete(index.PathOf("index/words"), recursive: true);
        Assert.Contains("«thaw»", Snippet("thaw sluice"), StringComparison.Ordinal);
        Assert.Equal(0, index.Run("verify").ExitCode);

        // A writer raises the schema to 2 and leaves the old records' words where they are.
        index.Json("sync");
        using var after = OpenCatalog();
        Assert.Equal(2, after.GetCollection(CatalogSchema.Meta).FindById("schema")["version"].AsInt32);
        Assert.Contains(after.GetCollection(CatalogSchema.Pages).FindAll(), p => p["Words"].AsArray.Count > 0);
        after.Dispose();
        Assert.Contains("«thaw»", Snippet("thaw sluice"), StringComparison.Ordinal);
    }

    private string Snippet(string query) =>
        index.Json("search", query, "-k", "1").GetProperty("hits").EnumerateArray().First().GetProperty("snippet").GetString()!;

    private LiteDatabase OpenCatalog() =>
        new(new ConnectionString { Filename = index.PathOf("index/" + CatalogSchema.FileName), Connection = ConnectionType.Direct });

    /// <summary>The words of one page read from the store, turned into schema-1 word documents.</summary>
    private List<BsonValue> ReadBack(string pageKey, BsonDocument at)
    {
        using var reader = Core.Storage.PageWordStore.OpenForReading(index.PathOf("index"));
        var location = new Core.Storage.PageWordsLocation(at["File"].AsInt64, at["Offset"].AsInt64, at["Length"].AsInt32, (uint)at["Checksum"].AsInt64);
        return reader.Read(Core.Documents.PageKey.Parse(pageKey), location)
            .Select(w => (BsonValue)new BsonDocument { ["T"] = w.Text, ["L"] = w.Box.Left, ["B"] = w.Box.Bottom, ["R"] = w.Box.Right, ["U"] = w.Box.Top })
            .ToList();
    }
}
