using IndexKeeper.Core.Catalog;
using IndexKeeper.Service.Querying;

namespace IndexKeeper.Service.Application;

/// <summary><c>/api/documents</c>: the catalog's documents, optionally of one root, a page at a time.</summary>
public sealed class DocumentListOperation(OpenIndex index)
{
    public DocumentListReport List(string? root, int skip, int take)
    {
        var documents = (root is null ? index.Catalog.Documents.All() : index.Catalog.Documents.OfRoot(root))
            .OrderBy(d => d.Root, StringComparer.Ordinal).ThenBy(d => d.Path, StringComparer.Ordinal).ToList();
        return new DocumentListReport
        {
            Total = documents.Count,
            Skip = skip,
            Documents = documents.Skip(skip).Take(take).Select(d => new DocumentListEntry(
                d.Root, d.Path, d.State, d.Kind, d.PageKeys.Count, d.Size, d.LastChangedUtc.ToUniversalTime(),
                d.State == DocumentState.Quarantined ? $"{d.QuarantineReason}: {d.QuarantineMessage}" : null)).ToList(),
        };
    }
}
