using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Index;
using IndexKeeper.Core.Search;
using IndexKeeper.Tests.Storage;

namespace IndexKeeper.Tests.Search;

/// <summary>
/// Equal scores must rank the same in two indexes that hold the same vector sets in different segment
/// layouts (found by the churn simulator: an incrementally kept index and its rebuild gave different
/// top-10s on ties, because ties went to the page appended first).
/// </summary>
public sealed class TieOrderTests
{
    private const int Dimensions = 64;
    private static readonly EncoderIdentity Encoder = new(TestVectors.EncoderId, "test", "tie order test encoder", Dimensions);

    [Fact]
    public void Ties_rank_alike_whatever_order_the_vector_sets_were_appended_in()
    {
        // Every page holds the same vectors, so every query scores every page alike: the order is all tie-break.
        var pages = Enumerable.Range(0, 40).ToList();
        var query = TestVectors.Set(99, 3, Dimensions);
        var forward = TopTen(pages, query);
        var backward = TopTen([.. Enumerable.Reverse(pages)], query);
        Assert.Equal(forward, backward);
        Assert.Equal(forward.Order(StringComparer.Ordinal), forward);
    }

    private static List<string> TopTen(IReadOnlyList<int> appendOrder, VectorSet query)
    {
        using var directory = new Support.TempDirectory();
        using var indexLock = IndexLock.Acquire(directory.Path, "tie order test");
        using var catalog = IndexCatalog.Open(indexLock);
        using var store = VectorStore.Open(catalog, directory.Path);
        var edit = new CatalogEdit();
        edit.AddPages.AddRange(appendOrder.Select(p => new PageRecord { Id = TestVectors.Key(p).Hex, References = 1 }));
        catalog.Apply(edit);
        var same = TestVectors.Set(7, 12, Dimensions);
        foreach (var batch in appendOrder.Chunk(8))
        {
            store.AppendAndCommit(Encoder, batch.Select(p => (TestVectors.Key(p), same)).ToList());
            // One segment per batch: the layouts of the two indexes differ in segments and offsets.
            store.SealAll();
        }

        using var live = store.OpenLive(Encoder.Id);
        // Candidates below the page count, so the sign-code first stage cuts among ties too.
        var options = new SearchOptions { Top = 10, Candidates = 15, Parallelism = 2 };
        return [.. LateInteractionSearch.Search(live.Source, query, options, CancellationToken.None).Hits.Select(h => h.Key.Hex)];
    }
}
