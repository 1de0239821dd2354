using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Detect;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Pipeline;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Pipeline;

/// <summary>
/// Scenario tests of Detect → Read → Diff with a line-per-page stand-in reader: what each kind of change
/// costs (reads, new page keys) and what the catalog holds afterwards.
/// </summary>
public sealed class ScanPassTests : IDisposable
{
    private readonly TempDirectory temp = new();
    private readonly LinePageReader reader = new();
    private readonly IndexLock heldLock;
    private readonly IndexCatalog catalog;

    public ScanPassTests()
    {
        heldLock = IndexLock.Acquire(temp.Combine("index"), "test");
        catalog = IndexCatalog.Open(heldLock);
    }

    private string RootA => temp.Combine("a");

    private string RootB => temp.Combine("b");

    [Fact]
    public void First_scan_counts_every_page_new_and_queues_distinct_keys()
    {
        temp.Write("a/m1.txt", "p1\np2\np3");
        temp.Write("a/m2.txt", "p3\np4");
        var s = Scan();
        Assert.Equal((2, 2, 5), (s.DocumentsSeen, s.DocumentsNew, s.PagesSeen));
        Assert.Equal(4, s.PagesNew);
        Assert.Equal(1, s.PagesReused);
        Assert.Equal(0, s.PagesEmbedded);
        Assert.Equal(4, catalog.Queue.InOrder().Count());
        Assert.Equal(5, catalog.Figures().PageLocations);
    }

    [Fact]
    public void Unchanged_rescan_reads_and_hashes_nothing()
    {
        temp.Write("a/m1.txt", "p1\np2");
        Scan();
        var reads = reader.Reads;
        var s = Scan();
        Assert.Equal((1, 1, 0L), (s.DocumentsUnchanged, s.DocumentsSeen, s.FilesHashed));
        Assert.Equal(reads, reader.Reads);
        Assert.Equal(2, s.PagesSeen);
    }

    [Fact]
    public void Touched_identical_file_costs_one_hash_and_no_read()
    {
        var path = temp.Write("a/m1.txt", "p1\np2");
        Scan();
        File.SetLastWriteTimeUtc(path, DateTime.UtcNow.AddHours(-3));
        var reads = reader.Reads;
        var s = Scan();
        Assert.Equal((1L, 1L, 0L), (s.DocumentsUnchanged, s.FilesHashed, s.PagesNew));
        Assert.Equal(reads, reader.Reads);
        Assert.Equal(0, Scan().FilesHashed);
    }

    [Fact]
    public void Copy_into_another_folder_costs_no_read_and_no_new_page()
    {
        temp.Write("a/reports/r1.txt", "x1\nx2\nx3");
        Scan();
        Directory.CreateDirectory(temp.Combine("a/final"));
        File.Copy(temp.Combine("a/reports/r1.txt"), temp.Combine("a/final/r1.txt"));
        var reads = reader.Reads;
        var s = Scan();
        Assert.Equal((1L, 1L, 0L, 3L), (s.DocumentsNew, s.DocumentsCopied, s.PagesNew, s.PagesReused));
        Assert.Equal(reads, reader.Reads);
        Assert.Equal(6, catalog.Figures().PageLocations);
        Assert.Equal(3, catalog.Figures().Pages);
    }

    [Fact]
    public void Rename_and_move_across_roots_keep_every_page_key()
    {
        temp.Write("a/f1.txt", "k1\nk2");
        temp.Write("a/f2.txt", "k3");
        Scan();
        File.Move(temp.Combine("a/f1.txt"), temp.Combine("a/renamed.txt"));
        Directory.CreateDirectory(RootB);
        File.Move(temp.Combine("a/f2.txt"), temp.Combine("b/f2.txt"));
        var reads = reader.Reads;
        var s = Scan();
        Assert.Equal((2L, 2L, 2L), (s.DocumentsNew, s.DocumentsDeleted, s.DocumentsMoved));
        Assert.Equal((0L, 0L), (s.PagesNew, s.PagesRemoved));
        Assert.Equal(reads, reader.Reads);
        Assert.Equal(3, catalog.Figures().Pages);
        Assert.NotNull(catalog.Documents.Find("b", "f2.txt"));
        Assert.Null(catalog.Documents.Find("a", "f2.txt"));
    }

    [Fact]
    public void Deleting_the_only_holder_removes_its_pages_and_queue_entries()
    {
        temp.Write("a/f1.txt", "k1\nk2");
        temp.Write("a/f2.txt", "k2\nk9");
        Scan();
        File.Delete(temp.Combine("a/f1.txt"));
        var s = Scan();
        Assert.Equal((1L, 1L), (s.DocumentsDeleted, s.PagesRemoved));
        Assert.Null(catalog.Pages.Find(PageKey.Of("k1"u8).Hex));
        Assert.Equal(1, catalog.Pages.Find(PageKey.Of("k2"u8).Hex)!.References);
        Assert.DoesNotContain(catalog.Queue.InOrder(), q => q.Id == PageKey.Of("k1"u8).Hex);
    }

    [Fact]
    public void Inserted_and_reordered_pages_cost_only_the_new_page()
    {
        var path = temp.Write("a/manual.txt", "s1\ns2\ns3\ns4");
        Scan();
        File.WriteAllText(path, "s3\ns1\nINSERTED\ns2\ns4");
        var s = Scan();
        Assert.Equal((1L, 1L, 4L, 0L), (s.DocumentsChanged, s.PagesNew, s.PagesReused, s.PagesRemoved));
        var keys = catalog.Documents.Find("a", "manual.txt")!.PageKeys;
        Assert.Equal(PageKey.Of("INSERTED"u8).Hex, keys[2]);
    }

    [Fact]
    public void Edited_page_replaces_one_key()
    {
        var path = temp.Write("a/manual.txt", "s1\ns2\ns3");
        Scan();
        File.WriteAllText(path, "s1\ns2 edited\ns3");
        var s = Scan();
        Assert.Equal((1L, 2L, 1L), (s.PagesNew, s.PagesReused, s.PagesRemoved));
    }

    [Fact]
    public void Bad_file_is_quarantined_with_reason_and_retried_only_when_it_changes()
    {
        var path = temp.Write("a/broken.txt", "BAD bytes");
        temp.Write("a/good.txt", "g1");
        var s = Scan();
        Assert.Equal((1L, 1L), (s.DocumentsQuarantined, s.DocumentsNew - 1));
        var record = catalog.Documents.Find("a", "broken.txt")!;
        Assert.Equal((DocumentState.Quarantined, QuarantineReason.Corrupt), (record.State, record.QuarantineReason!.Value));
        var reads = reader.Reads;
        Assert.Equal(0, Scan().DocumentsQuarantined);
        Assert.Equal(reads, reader.Reads);
        File.WriteAllText(path, "fixed1\nfixed2");
        s = Scan();
        Assert.Equal((1L, 2L), (s.DocumentsChanged, s.PagesNew));
        Assert.Equal(DocumentState.Live, catalog.Documents.Find("a", "broken.txt")!.State);
    }

    [Fact]
    public void File_replaced_while_being_read_is_deferred_then_taken_next_pass()
    {
        var path = temp.Write("a/live.txt", "v1");
        reader.OnRead = p =>
        {
            reader.OnRead = null;
            File.WriteAllText(p, "v2 longer text");
        };
        var s = Scan();
        Assert.Equal((1L, 0L), (s.DocumentsDeferred, s.DocumentsNew));
        Assert.Null(catalog.Documents.Find("a", "live.txt"));
        s = Scan();
        Assert.Equal(1, s.DocumentsNew);
        Assert.Equal(PageKey.Of("v2 longer text"u8).Hex, catalog.Documents.Find("a", "live.txt")!.PageKeys.Single());
        Assert.True(File.Exists(path));
    }

    [Fact]
    public void Missing_root_is_reported_and_its_documents_are_kept()
    {
        temp.Write("a/f1.txt", "k1");
        temp.Write("b/f2.txt", "k2");
        Scan();
        Directory.Move(RootB, temp.Combine("b-unmounted"));
        var s = Scan();
        Assert.Equal(["b"], s.RootsMissing);
        Assert.Equal(0, s.DocumentsDeleted);
        Assert.NotNull(catalog.Documents.Find("b", "f2.txt"));
    }

    [Fact]
    public void Zero_byte_file_goes_to_the_reader_and_has_no_pages()
    {
        temp.Write("a/empty.txt", string.Empty);
        var s = Scan();
        Assert.Equal((1L, 0L), (s.DocumentsNew, s.PagesSeen));
    }

    [Fact]
    public void Small_batches_give_the_same_result_as_one_batch()
    {
        for (var i = 0; i < 20; i++)
        {
            temp.Write($"a/d{i:00}.txt", $"common\nunique{i}");
        }

        var s = Scan(batchSize: 3);
        Assert.Equal((21L, 19L), (s.PagesNew, s.PagesReused));
        Assert.Equal(20, catalog.Pages.Find(PageKey.Of("common"u8).Hex)!.References);
        foreach (var i in Enumerable.Range(0, 20))
        {
            File.Move(temp.Combine($"a/d{i:00}.txt"), temp.Combine($"a/moved-{i:00}.txt"));
        }

        s = Scan(batchSize: 3);
        Assert.Equal((0L, 0L, 20L), (s.PagesNew, s.PagesRemoved, s.DocumentsMoved));
        Assert.Equal(20, catalog.Pages.Find(PageKey.Of("common"u8).Hex)!.References);
    }

    public void Dispose()
    {
        catalog.Dispose();
        heldLock.Dispose();
        temp.Dispose();
    }

    private ScanSummary Scan(int batchSize = 256)
    {
        Directory.CreateDirectory(RootA);
        var roots = new List<RootSpec> { new("a", RootA, [], []) };
        if (Directory.Exists(RootB) || Directory.Exists(temp.Combine("b-unmounted")))
        {
            roots.Add(new RootSpec("b", RootB, [], []));
        }

        var settings = new ScanSettings(roots, ReadLimits.Default, TimeSpan.Zero, batchSize);
        return new ScanPass(catalog, reader, settings).Run("test", CancellationToken.None);
    }
}
