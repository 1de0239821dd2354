namespace IndexKeeper.Core.Catalog;

/// <summary>
/// A batch of catalog changes applied in one transaction by <see cref="IndexCatalog.Apply"/>: either all
/// of it is visible after a crash or none of it, so documents and page reference counts always agree.
/// </summary>
public sealed class CatalogEdit
{
    public List<DocumentRecord> PutDocuments { get; } = [];

    public List<string> DeleteDocuments { get; } = [];

    /// <summary>Pages seen for the first time, with their reference count.</summary>
    public List<PageRecord> AddPages { get; } = [];

    /// <summary>
    /// New reference counts of existing pages. A page at zero is kept until <see cref="IndexCatalog.RemoveUnreferencedPages"/>
    /// (the end of a scan), because a move can drop a key to zero in one batch and bring it back in the next.
    /// </summary>
    public List<(string Key, int References)> SetReferences { get; } = [];

    public List<QueueRecord> Enqueue { get; } = [];

    public bool IsEmpty =>
        PutDocuments.Count == 0 && DeleteDocuments.Count == 0 && AddPages.Count == 0 && SetReferences.Count == 0 && Enqueue.Count == 0;
}
