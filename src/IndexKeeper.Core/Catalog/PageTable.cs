using LiteDB;

namespace IndexKeeper.Core.Catalog;

/// <summary>The catalog's pages: one record per page key, with its words and how many locations hold it.</summary>
public sealed class PageTable
{
    private readonly ILiteCollection<PageRecord> pages;

    internal PageTable(CatalogStore store) => pages = store.Pages;

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

    /// <summary>A page's reference count and where it was seen (root, path, 1-based page), read without deserialising its words; null when it has no record.</summary>
    internal (int References, string Root, string Path, int Page)? SourceOf(string pageKey)
    {
        var found = pages.Query().Where(p => p.Id == pageKey)
            .Select(BsonExpression.Create("{ r: $.References, root: $.SourceRoot, path: $.SourcePath, page: $.SourcePage }"))
            .ToEnumerable().FirstOrDefault();
        return found is null ? null : (found["r"].AsInt32, found["root"].AsString, found["path"].AsString, found["page"].AsInt32);
    }

    /// <summary>A page's reference count (0 when it has no record), read without deserialising its words.</summary>
    internal int ReferencesOf(string pageKey) =>
        pages.Query().Where(p => p.Id == pageKey).Select(p => p.References).ToEnumerable().FirstOrDefault();
}
