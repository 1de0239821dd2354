using IndexKeeper.Core.Documents;
using LiteDB;

namespace IndexKeeper.Core.Catalog;

/// <summary>The catalog's documents: one record per file under a root, with the page keys it shows.</summary>
public sealed class DocumentTable
{
    private readonly ILiteCollection<DocumentRecord> documents;

    internal DocumentTable(CatalogStore store) => documents = store.Documents;

    public DocumentRecord? Find(string root, string path) => documents.FindById(DocumentRecord.MakeId(root, path));

    public DocumentRecord? FindById(string id) => documents.FindById(id);

    /// <summary>Live documents whose bytes hash to <paramref name="fileHash"/>: a new path with one of these is a copy.</summary>
    public IReadOnlyList<DocumentRecord> LiveWithFileHash(string fileHash) =>
        documents.Find(d => d.FileHash == fileHash && d.State == DocumentState.Live).ToList();

    public IEnumerable<DocumentRecord> OfRoot(string root) => documents.Find(d => d.Root == root);

    public IEnumerable<DocumentRecord> Quarantined() => documents.Find(d => d.State == DocumentState.Quarantined);

    public IEnumerable<DocumentRecord> All() => documents.FindAll();

    /// <summary>Live documents by kind, for the file tally of <c>status</c>.</summary>
    public IReadOnlyDictionary<DocumentKind, long> LiveByKind() =>
        documents.Find(d => d.State == DocumentState.Live).GroupBy(d => d.Kind).ToDictionary(g => g.Key, g => g.LongCount());

    /// <summary>Per-root totals for the daemon's figures; reads only the fields it counts.</summary>
    public IReadOnlyList<RootTotals> TotalsByRoot() =>
        documents.Query().Select(d => new { d.Root, d.State, d.Size, Pages = d.PageKeys.Count }).ToEnumerable()
            .GroupBy(d => d.Root, StringComparer.Ordinal)
            .Select(g => new RootTotals(
                g.Key,
                g.LongCount(d => d.State == DocumentState.Live),
                g.LongCount(d => d.State == DocumentState.Quarantined),
                g.Where(d => d.State == DocumentState.Live).Sum(d => (long)d.Pages),
                g.Where(d => d.State == DocumentState.Live).Sum(d => d.Size)))
            .OrderBy(t => t.Root, StringComparer.Ordinal)
            .ToList();

    public IEnumerable<string> RootNames() => documents.Query().Select(d => d.Root).ToEnumerable().Distinct(StringComparer.Ordinal);

    /// <summary>Live documents holding a page key: where a search hit is shown.</summary>
    public IReadOnlyList<DocumentRecord> Holding(string pageKey) =>
        documents.Find(BsonExpression.Create("$.PageKeys[*] ANY = @0", new BsonValue(pageKey))).ToList();
}
