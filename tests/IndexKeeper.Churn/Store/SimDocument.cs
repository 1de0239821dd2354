namespace IndexKeeper.Churn.Store;

/// <summary>
/// One document of the simulated store as the simulator models it: what each page shows (content ids,
/// in page order) and how to write its bytes. Copies are deep, so editing one copy leaves the other.
/// </summary>
internal abstract class SimDocument
{
    /// <summary>"manual", "deck", "report", "form", "drawing", "scan".</summary>
    public abstract string Kind { get; }

    public abstract IReadOnlyList<ulong> Pages { get; }

    /// <summary>File name extension with its dot.</summary>
    public virtual string Extension => ".pdf";

    /// <summary>Pages can be edited, inserted and deleted one at a time.</summary>
    public virtual bool PageEditable => false;

    /// <summary>The document information can change without any page changing.</summary>
    public virtual bool HasMetadata => false;

    public PdfLayout Layout { get; set; }

    /// <summary>Number of metadata edits so far (title and date in the document information).</summary>
    public int MetadataRevision { get; set; }

    public abstract byte[] Render();

    public abstract SimDocument Clone();

    /// <summary>A new revision in which every page changes (a report re-issued, a form re-filled, a sheet re-scanned).</summary>
    public abstract void Revise(string revisionName);

    public virtual void EditPage(int index, ulong seed) => throw new NotSupportedException(Kind);

    public virtual void InsertPage(int after, ulong seed) => throw new NotSupportedException(Kind);

    /// <summary>Indexes of pages that may be deleted without changing another page.</summary>
    public virtual IReadOnlyList<int> DeletablePages() => [];

    public virtual void DeletePage(int index) => throw new NotSupportedException(Kind);

    /// <summary>Indexes of pages whose edit changes no other page.</summary>
    public virtual IReadOnlyList<int> EditablePages() => Enumerable.Range(0, Pages.Count).ToList();
}
