using IndexKeeper.Core.Catalog;
using IndexKeeper.Service.Hosting;

namespace IndexKeeper.Service.Querying;

/// <summary>Lists the catalog's documents, optionally of one root, a page at a time.</summary>
public static class DocumentLister
{
    public static DocumentListReport List(IndexSession session, string? root, int skip, int take)
    {
        ArgumentNullException.ThrowIfNull(session);
        var documents = (root is null ? session.Catalog.Documents.All() : session.Catalog.Documents.OfRoot(root))
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
