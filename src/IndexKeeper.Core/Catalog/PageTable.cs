using LiteDB;

namespace IndexKeeper.Core.Catalog;

/// <summary>The catalog's pages: one record per page key, with its words and how many locations hold it.</summary>
public sealed class PageTable
{
    private readonly CatalogStore store;
    private readonly ILiteCollection<PageRecord> pages;

    internal PageTable(CatalogStore store) => (this.store, pages) = (store, store.Pages);

    public PageRecord? Find(string pageKey) => pages.FindById(pageKey);

    public IEnumerable<PageRecord> All() => pages.FindAll();

    /// <summary>Page keys that live documents hold.</summary>
    public IEnumerable<string> ReferencedKeys() =>
        pages.Query().Where(p => p.References > 0).Select(p => p.Id).ToEnumerable();

    /// <summary>Page keys no live document holds (left by an interrupted pass; the next pass removes them).</summary>
    public IEnumerable<string> UnreferencedKeys() =>
        pages.Query().Where(p => p.References <= 0).Select(p => p.Id).ToEnumerable();

    /// <summary>Every page whose words are in the page-word store, with where they are; read without deserialising schema-1 words.</summary>
    public IEnumerable<(string Key, WordsAtRecord At)> WordLocations() =>
        pages.Query().Where("$.WordsAt != null")
            .Select(BsonExpression.Create("{ k: $._id, f: $.WordsAt.File, o: $.WordsAt.Offset, l: $.WordsAt.Length, c: $.WordsAt.Checksum }"))
            .ToEnumerable()
            .Select(d => (d["k"].AsString, new WordsAtRecord { File = d["f"].AsInt64, Offset = d["o"].AsInt64, Length = d["l"].AsInt32, Checksum = d["c"].AsInt64 }));

    /// <summary>
    /// Pages' reference counts and where each was seen (root, path, 1-based page), by key, read without mapping their
    /// words into records; a page without a record is absent.
    /// </summary>
    internal Dictionary<string, (int References, string Root, string Path, int Page)> SourcesOf(IEnumerable<string> pageKeys) =>
        store.PageDocuments(pageKeys).ToDictionary(p => p.Key, p => Source(p.Value), StringComparer.Ordinal);

    /// <summary>A page's reference count (0 when it has no record), read without mapping its words into records.</summary>
    internal int ReferencesOf(string pageKey) => store.PageReferences(pageKey);

    /// <summary>As <see cref="ReferencesOf(string)"/> for many pages at once, by key (a page without a record is absent).</summary>
    internal Dictionary<string, int> ReferencesOf(IEnumerable<string> pageKeys) =>
        store.PageDocuments(pageKeys).ToDictionary(p => p.Key, p => CatalogStore.References(p.Value), StringComparer.Ordinal);

    private static (int References, string Root, string Path, int Page) Source(BsonDocument found) =>
        (CatalogStore.References(found), found[nameof(PageRecord.SourceRoot)].AsString, found[nameof(PageRecord.SourcePath)].AsString, found[nameof(PageRecord.SourcePage)].AsInt32);
}
