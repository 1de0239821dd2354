using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Documents.Isolation;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Index;
using IndexKeeper.Service.Hosting;

namespace IndexKeeper.Service.Application;

/// <summary>
/// An open index, held by the composition root of one command or of the daemon: the lock, the catalog,
/// the document reader, the segment store and the active encoder, released together. The lock is taken
/// first and released last, so no other process ever sees the catalog open.
/// </summary>
public sealed class OpenIndex : IDisposable
{
    private readonly IndexLock indexLock;
    private readonly IndexSettings settings;
    private VectorStore? store;
    private IPageEncoder? encoder;
    private ServingViews? serving;

    private OpenIndex(IndexSettings settings, IndexLock indexLock, IndexCatalog catalog, IDocumentReader reader, bool readOnly)
    {
        this.settings = settings;
        this.indexLock = indexLock;
        Catalog = catalog;
        Reader = reader;
        ReadOnly = readOnly;

        // A writer hears every commit from the open on, so its serving views move forward instead of being rebuilt.
        serving = readOnly ? null : new ServingViews(catalog, () => Store, indexLock.Directory, readOnly: false);
    }

    /// <summary>Opened by <see cref="OpenReadOnly"/>: neither the catalog nor the segments can be written.</summary>
    public bool ReadOnly { get; }

    public IndexCatalog Catalog { get; }

    public IDocumentReader Reader { get; }

    public string Directory => indexLock.Directory;

    /// <summary>
    /// The segment store, opened on first use: for writing it is repaired after a crash first; a read-only
    /// index opens it for reading only (nothing created, nothing repaired, every write refused).
    /// </summary>
    public VectorStore Store => store ??= ReadOnly
        ? VectorStore.OpenForReading(Catalog, Directory)
        : VectorStore.Open(Catalog, Directory, settings.Segments);

    /// <summary>The serving views (page directory and candidate graph per encoder) that search reads.</summary>
    public ServingViews Serving => serving ??= new ServingViews(Catalog, () => Store, Directory, ReadOnly);

    /// <summary>The active encoder, built on first use (a model load is not paid by commands that do not encode).</summary>
    public IPageEncoder Encoder => encoder ??= EncoderFactory.Create(settings.Encoder);

    public static OpenIndex Open(IndexSettings settings, string purpose) => Open(settings, purpose, readOnly: false);

    /// <summary>Opens for reading only (plan, status, search, encoders): the lock is taken, no byte of the index is changed.</summary>
    public static OpenIndex OpenReadOnly(IndexSettings settings, string purpose) => Open(settings, purpose, readOnly: true);

    /// <summary>
    /// Opens for a catalog rebuild: <paramref name="beforeCatalog"/> runs once the lock is held and before the
    /// catalog is opened (it moves the old catalog aside), so no other process sees the index in between.
    /// </summary>
    public static OpenIndex OpenForRebuild(IndexSettings settings, string purpose, Action<string> beforeCatalog) =>
        Open(settings, purpose, readOnly: false, beforeCatalog);

    private static OpenIndex Open(IndexSettings settings, string purpose, bool readOnly, Action<string>? beforeCatalog = null)
    {
        ArgumentNullException.ThrowIfNull(settings);
        var held = IndexLock.Acquire(settings.Directory, purpose);
        try
        {
            beforeCatalog?.Invoke(held.Directory);
            var catalog = readOnly ? IndexCatalog.OpenReadOnly(held) : IndexCatalog.Open(held);
            // Documents are parsed in a worker process: a parser that crashes, hangs or blows up its memory
            // costs one quarantined document, never the command or the service.
            return new OpenIndex(settings, held, catalog, IsolatedReaderFactory.Create(settings.Reader), readOnly);
        }
        catch
        {
            held.Dispose();
            throw;
        }
    }

    public void Dispose()
    {
        PersistServingViews();
        serving?.Dispose();
        store?.Dispose();
        (encoder as IDisposable)?.Dispose();
        (Reader as IDisposable)?.Dispose();
        Catalog.Dispose();
        indexLock.Dispose();
    }

    /// <summary>
    /// A writer leaves its serving views on disk for the next search process. They are a cache of the catalog:
    /// when this fails (a fault left the catalog unusable, the disk is full) the file stays stale and the next
    /// search builds the view in memory, so nothing is lost and the command's own outcome stands.
    /// </summary>
    private void PersistServingViews()
    {
        try
        {
            serving?.Persist(CancellationToken.None);
        }
        catch (Exception ex) when (ex is not OutOfMemoryException)
        {
            System.Diagnostics.Trace.TraceWarning($"The serving view was not written: {ex.Message}");
        }
    }
}
