using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Documents.Isolation;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Index;
using IndexKeeper.Core.Storage;
using IndexKeeper.Service.Hosting;

namespace IndexKeeper.Service.Application;

/// <summary>
/// An open index, held by the composition root of one command or of the daemon: the lock, the catalog,
/// the document reader, the segment store and the active encoder, released together. The lock (the
/// writer's <see cref="IndexLock"/>, or a reader's shared <see cref="ReaderGate"/>) is taken first and
/// released last.
/// </summary>
public sealed class OpenIndex : IDisposable
{
    private readonly IDisposable held;
    private VectorStore? store;
    private IPageEncoder? encoder;
    private ServingViews? serving;
    private PageWordStore? words;

    private OpenIndex(IndexSettings settings, IDisposable held, string directory, IndexCatalog catalog, IDocumentReader reader, bool readOnly)
    {
        Settings = settings;
        this.held = held;
        Directory = directory;
        Catalog = catalog;
        Reader = reader;
        ReadOnly = readOnly;

        // A writer hears every commit from the open on, so its serving views move forward instead of being rebuilt.
        serving = readOnly ? null : new ServingViews(catalog, () => Store, directory, readOnly: false, settings.Candidates);
    }

    /// <summary>
    /// The settings this index is used with: the configured ones, the encoder's completed from the index's
    /// own where the configuration does not name one (<see cref="EncoderChoice"/>). Compose with these.
    /// </summary>
    public IndexSettings Settings { get; }

    /// <summary>Opened by <see cref="OpenReadOnly"/>: neither the catalog nor the segments can be written.</summary>
    public bool ReadOnly { get; }

    public IndexCatalog Catalog { get; }

    public IDocumentReader Reader { get; }

    public string Directory { get; }

    /// <summary>
    /// The segment store, opened on first use: for writing it is repaired after a crash first; a read-only
    /// index opens it for reading only (nothing created, nothing repaired, every write refused).
    /// </summary>
    public VectorStore Store => store ??= ReadOnly
        ? VectorStore.OpenForReading(Catalog, Directory)
        : VectorStore.Open(Catalog, Directory, Settings.Segments);

    /// <summary>Page words and boxes (for text encoders, snippets and match maps), opened on first use; read-only for a reader.</summary>
    public PageWordStore Words => words ??= ReadOnly ? PageWordStore.OpenForReading(Directory) : PageWordStore.OpenForWriting(Directory);

    /// <summary>The serving views (page directory and candidate graph per encoder) that search reads.</summary>
    public ServingViews Serving => serving ??= new ServingViews(Catalog, () => Store, Directory, ReadOnly, Settings.Candidates);

    /// <summary>The active encoder, built on first use (a model load is not paid by commands that do not encode).</summary>
    public IPageEncoder Encoder => encoder ??= EncoderFactory.Create(Settings.Encoder);

    public static OpenIndex Open(IndexSettings settings, string purpose) => Open(settings, purpose, beforeCatalog: null);

    /// <summary>
    /// Opens for reading only (plan, status, search, encoders, verify) beside a writer, if one runs: no
    /// write lock, no byte of the index changed; it sees what was committed when it opened.
    /// </summary>
    public static OpenIndex OpenReadOnly(IndexSettings settings)
    {
        ArgumentNullException.ThrowIfNull(settings);
        var gate = ReaderGate.EnterShared(settings.Directory);
        try
        {
            var catalog = IndexCatalog.OpenReadOnly(gate);
            return new OpenIndex(settings.ForIndex(catalog), gate, gate.Directory, catalog, IsolatedReaderFactory.Create(settings.Reader), readOnly: true);
        }
        catch
        {
            gate.Dispose();
            throw;
        }
    }

    /// <summary>
    /// Opens for a catalog rebuild: <paramref name="beforeCatalog"/> runs once the lock is held and before the
    /// catalog is opened (it moves the old catalog aside), so no other process sees the index in between.
    /// </summary>
    public static OpenIndex OpenForRebuild(IndexSettings settings, string purpose, Action<string> beforeCatalog) =>
        Open(settings, purpose, beforeCatalog);

    private static OpenIndex Open(IndexSettings settings, string purpose, Action<string>? beforeCatalog)
    {
        ArgumentNullException.ThrowIfNull(settings);
        var writerLock = IndexLock.Acquire(settings.Directory, purpose);
        try
        {
            beforeCatalog?.Invoke(writerLock.Directory);
            var catalog = IndexCatalog.Open(writerLock);
            // Documents are parsed in a worker process: a parser that crashes, hangs or blows up its memory
            // costs one quarantined document, never the command or the service.
            return new OpenIndex(settings.ForIndex(catalog), writerLock, writerLock.Directory, catalog, IsolatedReaderFactory.Create(settings.Reader), readOnly: false);
        }
        catch
        {
            writerLock.Dispose();
            throw;
        }
    }

    public void Dispose()
    {
        PersistServingViews();
        serving?.Dispose();
        store?.Dispose();
        words?.Dispose();
        (encoder as IDisposable)?.Dispose();
        (Reader as IDisposable)?.Dispose();
        Catalog.Dispose();
        held.Dispose();
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
