namespace IndexKeeper.Service.Querying;

/// <summary>A page of the catalog's documents (<c>/api/documents</c>), ordered by root and path.</summary>
public sealed class DocumentListReport
{
    public long Total { get; init; }

    public int Skip { get; init; }

    public IReadOnlyList<DocumentListEntry> Documents { get; init; } = [];
}
