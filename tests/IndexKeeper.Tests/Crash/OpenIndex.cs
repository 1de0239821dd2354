using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Index;
using IndexKeeper.Core.Pipeline;
using IndexKeeper.Core.Queue;
using IndexKeeper.Core.Storage;
using IndexKeeper.Tests.Storage;

namespace IndexKeeper.Tests.Crash;

/// <summary>
/// An index opened in-process as a command opens it (lock, catalog, then the store, whose open runs
/// recovery), with seeded random vector sets of a 64-dimension test encoder. Each call of <see cref="Add"/>
/// adds one document holding its pages, each page once, and queues them, as a scan would.
/// </summary>
internal sealed class OpenIndex : IDisposable
{
    public static readonly EncoderIdentity Encoder = new(TestVectors.EncoderId, "seeded-random", "seeded random vectors for storage tests", 64);

    private readonly IndexLock indexLock;

    /// <param name="readOnlyStore">Open the store as read commands do: nothing repaired at open.</param>
    public OpenIndex(string directory, SegmentWriterOptions? writerOptions = null, bool readOnlyStore = false)
    {
        indexLock = IndexLock.Acquire(directory, "crash recovery test");
        Catalog = IndexCatalog.Open(indexLock);
        Store = readOnlyStore ? VectorStore.OpenForReading(Catalog, directory) : VectorStore.Open(Catalog, directory, writerOptions);
        Words = readOnlyStore ? PageWordStore.OpenForReading(directory) : PageWordStore.OpenForWriting(directory);
    }

    public IndexCatalog Catalog { get; }

    public VectorStore Store { get; }

    public PageWordStore Words { get; }

    public void Add(IEnumerable<int> pages)
    {
        var list = pages.ToList();
        var edit = new CatalogEdit();
        var now = DateTime.UtcNow;
        var path = $"notes/{list[0]}.pdf";
        edit.PutDocuments.Add(new DocumentRecord
        {
            Id = DocumentRecord.MakeId("test", path),
            Root = "test",
            Path = path,
            Kind = DocumentKind.Pdf,
            State = DocumentState.Live,
            PageKeys = [.. list.Select(p => TestVectors.Key(p).Hex)],
            FirstSeenUtc = now,
            LastChangedUtc = now,
        });
        edit.AddPages.AddRange(list.Select(p => new PageRecord { Id = TestVectors.Key(p).Hex, References = 1 }));
        edit.Enqueue.AddRange(list.Select(p => new QueueRecord { Id = TestVectors.Key(p).Hex, Priority = QueuePriority.Fresh, EnqueuedUtc = now, NotBeforeUtc = now }));
        Catalog.Apply(edit);
    }

    public void Commit(IEnumerable<int> pages) =>
        Store.AppendAndCommit(Encoder, pages.Select(p => (TestVectors.Key(p), TestVectors.Set(p, 12))).ToList());

    public VerifyReport Verify() => IndexVerifier.Verify(Catalog, Words, Store.Directory, Encoder.Id, CancellationToken.None);

    /// <summary>Page keys (hex) with a live vector set whose bytes read back.</summary>
    public HashSet<string> Readable()
    {
        using var live = Store.OpenLive(Encoder.Id);
        return Enumerable.Range(0, live.Source.Count).Select(i => live.Source.Get(i).Key.Hex).ToHashSet(StringComparer.Ordinal);
    }

    public void Dispose()
    {
        Words.Dispose();
        Store.Dispose();
        Catalog.Dispose();
        indexLock.Dispose();
    }
}
