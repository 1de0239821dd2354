using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Pipeline;
using IndexKeeper.Core.Queue;
using IndexKeeper.Tests.Crash;
using IndexKeeper.Tests.Storage;

namespace IndexKeeper.Tests.Pipeline;

/// <summary>One page the encoder cannot take: its neighbours are embedded, it is retried with a back-off and quarantined after the last attempt.</summary>
public sealed class EmbedRetryTests
{
    [Fact]
    public void AFailingPageIsIsolatedRetriedAndQuarantined()
    {
        using var dir = new TempDirectory();
        using var index = new OpenIndex(dir.Path);
        Add(index, [1, 2, 3, 4, 5, 6]);
        var bad = TestVectors.Key(4);
        var encoder = new PickyEncoder(bad);
        var policy = new RetryPolicy(3, TimeSpan.FromMilliseconds(1), TimeSpan.FromMilliseconds(1));
        var pass = new EmbedPass(index.Catalog, index.Store, index.Words, encoder, new Dictionary<string, string>(), batchSize: 6, retry: policy);

        var summary = new ScanSummary();
        Assert.Equal(5, pass.Run(summary, long.MaxValue, QueuePriority.Canary, CancellationToken.None));
        Assert.Equal(1, summary.PagesFailed);
        var entry = index.Catalog.Queue.InOrder().Single();
        Assert.Equal(bad.Hex, entry.Id);
        Assert.Equal(1, entry.Attempts);
        Assert.Equal("page refused", entry.LastError);
        Assert.Null(entry.QuarantinedUtc);

        for (var attempt = 2; attempt <= 3; attempt++)
        {
            Thread.Sleep(5);
            Assert.Equal(0, pass.Run(new ScanSummary(), long.MaxValue, QueuePriority.Canary, CancellationToken.None));
        }

        var quarantined = Assert.Single(index.Catalog.Queue.Quarantined());
        Assert.Equal(3, quarantined.Attempts);
        Assert.Equal(0, index.Catalog.Queue.Depths()[QueuePriority.Fresh]);
        Thread.Sleep(5);
        Assert.Equal(0, pass.Run(new ScanSummary(), long.MaxValue, QueuePriority.Canary, CancellationToken.None));
        Assert.Equal(3, index.Catalog.Queue.Quarantined().Single().Attempts);
        Assert.Equal(5, index.Readable().Count);
    }

    [Fact]
    public void ThePageLimitAndPriorityFilterAreKept()
    {
        using var dir = new TempDirectory();
        using var index = new OpenIndex(dir.Path);
        Add(index, [1, 2, 3, 4, 5]);
        var pass = new EmbedPass(index.Catalog, index.Store, index.Words, new PickyEncoder(null), new Dictionary<string, string>(), batchSize: 2);
        Assert.Equal(3, pass.Run(new ScanSummary(), 3, QueuePriority.Fresh, CancellationToken.None));
        Assert.Equal(2, index.Catalog.Queue.Depths()[QueuePriority.Fresh]);
    }

    /// <summary>One document holding the pages, each queued, as a scan leaves them.</summary>
    private static void Add(OpenIndex index, int[] pages)
    {
        var now = DateTime.UtcNow;
        var edit = new CatalogEdit();
        edit.PutDocuments.Add(new DocumentRecord
        {
            Id = DocumentRecord.MakeId("test", "log.pdf"),
            Root = "test",
            Path = "log.pdf",
            Kind = DocumentKind.Pdf,
            State = DocumentState.Live,
            PageKeys = [.. pages.Select(p => TestVectors.Key(p).Hex)],
            FirstSeenUtc = now,
            LastChangedUtc = now,
        });
        edit.AddPages.AddRange(pages.Select(p => new PageRecord { Id = TestVectors.Key(p).Hex, References = 1, SourceRoot = "test", SourcePath = "log.pdf", SourcePage = p }));
        edit.Enqueue.AddRange(pages.Select(p => new QueueRecord { Id = TestVectors.Key(p).Hex, Priority = QueuePriority.Fresh, EnqueuedUtc = now, NotBeforeUtc = now }));
        index.Catalog.Apply(edit);
    }

    /// <summary>Seeded test vectors for every page except one, which it refuses.</summary>
    private sealed class PickyEncoder(PageKey? refused) : IPageEncoder
    {
        public EncoderIdentity Identity => OpenIndex.Encoder;

        public IReadOnlyList<VectorSet> EncodePages(IReadOnlyList<PageToEncode> pages, CancellationToken cancellationToken) =>
            pages.Any(p => p.Key == refused)
                ? throw new InvalidOperationException("page refused")
                : pages.Select(p => TestVectors.Set(Enumerable.Range(0, 100).First(i => TestVectors.Key(i) == p.Key), 12)).ToList();

        public VectorSet EncodeQuery(string text, CancellationToken cancellationToken) => throw new NotSupportedException();
    }
}
