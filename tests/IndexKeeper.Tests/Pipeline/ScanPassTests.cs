using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Detect;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Pipeline;

namespace IndexKeeper.Tests.Pipeline;

/// <summary>
/// Scenario tests of Detect → Read → Diff with a line-per-page stand-in reader: what each kind of change
/// costs (reads, new page keys) and what the catalog holds afterwards.
/// </summary>
public sealed class ScanPassTests : LinePageScenario
{
    private string RootA => Temp.Combine("a");

    private string RootB => Temp.Combine("b");

    [Fact]
    public void First_scan_counts_every_page_new_and_queues_distinct_keys()
    {
        Temp.Write("a/m1.txt", "p1\np2\np3");
        Temp.Write("a/m2.txt", "p3\np4");
        var s = Scan();
        Assert.Equal((2, 2, 5), (s.DocumentsSeen, s.DocumentsNew, s.PagesSeen));
        Assert.Equal(4, s.PagesNew);
        Assert.Equal(1, s.PagesReused);
        Assert.Equal(0, s.PagesEmbedded);
        Assert.Equal(4, Catalog.Queue.InOrder().Count());
        Assert.Equal(5, Catalog.Figures().PageLocations);
    }

    [Fact]
    public void Unchanged_rescan_reads_and_hashes_nothing()
    {
        Temp.Write("a/m1.txt", "p1\np2");
        Scan();
        var reads = Reader.Reads;
        var s = Scan();
        Assert.Equal((1, 1, 0L), (s.DocumentsUnchanged, s.DocumentsSeen, s.FilesHashed));
        Assert.Equal(reads, Reader.Reads);
        Assert.Equal(2, s.PagesSeen);
    }

    [Fact]
    public void Touched_identical_file_costs_one_hash_and_no_read()
    {
        var path = Temp.Write("a/m1.txt", "p1\np2");
        Scan();
        File.SetLastWriteTimeUtc(path, DateTime.UtcNow.AddHours(-3));
        var reads = Reader.Reads;
        var s = Scan();
        Assert.Equal((1L, 1L, 0L), (s.DocumentsUnchanged, s.FilesHashed, s.PagesNew));
        Assert.Equal(reads, Reader.Reads);
        Assert.Equal(0, Scan().FilesHashed);
    }

    [Fact]
    public void Copy_into_another_folder_costs_no_read_and_no_new_page()
    {
        Temp.Write("a/reports/r1.txt", "x1\nx2\nx3");
        Scan();
        Directory.CreateDirectory(Temp.Combine("a/final"));
        File.Copy(Temp.Combine("a/reports/r1.txt"), Temp.Combine("a/final/r1.txt"));
        var reads = Reader.Reads;
        var s = Scan();
        Assert.Equal((1L, 1L, 0L, 3L), (s.DocumentsNew, s.DocumentsCopied, s.PagesNew, s.PagesReused));
        Assert.Equal(reads, Reader.Reads);
        Assert.Equal(6, Catalog.Figures().PageLocations);
        Assert.Equal(3, Catalog.Figures().Pages);
    }

    [Fact]
    public void Rename_and_move_across_roots_keep_every_page_key()
    {
        Temp.Write("a/f1.txt", "k1\nk2");
        Temp.Write("a/f2.txt", "k3");
        Scan();
        File.Move(Temp.Combine("a/f1.txt"), Temp.Combine("a/renamed.txt"));
        Directory.CreateDirectory(RootB);
        File.Move(Temp.Combine("a/f2.txt"), Temp.Combine("b/f2.txt"));
        var reads = Reader.Reads;
        var s = Scan();
        Assert.Equal((2L, 2L, 2L), (s.DocumentsNew, s.DocumentsDeleted, s.DocumentsMoved));
        Assert.Equal((0L, 0L), (s.PagesNew, s.PagesRemoved));
        Assert.Equal(reads, Reader.Reads);
        Assert.Equal(3, Catalog.Figures().Pages);
        Assert.NotNull(Catalog.Documents.Find("b", "f2.txt"));
        Assert.Null(Catalog.Documents.Find("a", "f2.txt"));
    }

    [Fact]
    public void Deleting_the_only_holder_removes_its_pages_and_queue_entries()
    {
        Temp.Write("a/f1.txt", "k1\nk2");
        Temp.Write("a/f2.txt", "k2\nk9");
        Scan();
        File.Delete(Temp.Combine("a/f1.txt"));
        var s = Scan();
        Assert.Equal((1L, 1L), (s.DocumentsDeleted, s.PagesRemoved));
        Assert.Null(Catalog.Pages.Find(PageKey.Of("k1"u8).Hex));
        Assert.Equal(1, Catalog.Pages.Find(PageKey.Of("k2"u8).Hex)!.References);
        Assert.DoesNotContain(Catalog.Queue.InOrder(), q => q.Id == PageKey.Of("k1"u8).Hex);
    }

    [Fact]
    public void Inserted_and_reordered_pages_cost_only_the_new_page()
    {
        var path = Temp.Write("a/manual.txt", "s1\ns2\ns3\ns4");
        Scan();
        File.WriteAllText(path, "s3\ns1\nINSERTED\ns2\ns4");
        var s = Scan();
        Assert.Equal((1L, 1L, 4L, 0L), (s.DocumentsChanged, s.PagesNew, s.PagesReused, s.PagesRemoved));
        var keys = Catalog.Documents.Find("a", "manual.txt")!.PageKeys;
        Assert.Equal(PageKey.Of("INSERTED"u8).Hex, keys[2]);
    }

    [Fact]
    public void Edited_page_replaces_one_key()
    {
        var path = Temp.Write("a/manual.txt", "s1\ns2\ns3");
        Scan();
        File.WriteAllText(path, "s1\ns2 edited\ns3");
        var s = Scan();
        Assert.Equal((1L, 2L, 1L), (s.PagesNew, s.PagesReused, s.PagesRemoved));
    }

    [Fact]
    public void Bad_file_is_quarantined_with_reason_and_retried_only_when_it_changes()
    {
        var path = Temp.Write("a/broken.txt", "BAD bytes");
        Temp.Write("a/good.txt", "g1");
        var s = Scan();
        Assert.Equal((1L, 1L), (s.DocumentsQuarantined, s.DocumentsNew - 1));
        var record = Catalog.Documents.Find("a", "broken.txt")!;
        Assert.Equal((DocumentState.Quarantined, QuarantineReason.Corrupt), (record.State, record.QuarantineReason!.Value));
        var reads = Reader.Reads;
        Assert.Equal(0, Scan().DocumentsQuarantined);
        Assert.Equal(reads, Reader.Reads);
        File.WriteAllText(path, "fixed1\nfixed2");
        s = Scan();
        Assert.Equal((1L, 2L), (s.DocumentsChanged, s.PagesNew));
        Assert.Equal(DocumentState.Live, Catalog.Documents.Find("a", "broken.txt")!.State);
    }

    [Fact]
    public void File_replaced_while_being_read_is_deferred_then_taken_next_pass()
    {
        var path = Temp.Write("a/live.txt", "v1");
        Reader.OnRead = p =>
        {
            Reader.OnRead = null;
            File.WriteAllText(p, "v2 longer text");
        };
        var s = Scan();
        Assert.Equal((1L, 0L), (s.DocumentsDeferred, s.DocumentsNew));
        Assert.Null(Catalog.Documents.Find("a", "live.txt"));
        s = Scan();
        Assert.Equal(1, s.DocumentsNew);
        Assert.Equal(PageKey.Of("v2 longer text"u8).Hex, Catalog.Documents.Find("a", "live.txt")!.PageKeys.Single());
        Assert.True(File.Exists(path));
    }

    [Fact]
    public void Missing_root_is_reported_and_its_documents_are_kept()
    {
        Temp.Write("a/f1.txt", "k1");
        Temp.Write("b/f2.txt", "k2");
        Scan();
        Directory.Move(RootB, Temp.Combine("b-unmounted"));
        var s = Scan();
        Assert.Equal(["b"], s.RootsMissing);
        Assert.Equal(0, s.DocumentsDeleted);
        Assert.NotNull(Catalog.Documents.Find("b", "f2.txt"));
    }

    [Fact]
    public void Zero_byte_file_goes_to_the_reader_and_has_no_pages()
    {
        Temp.Write("a/empty.txt", string.Empty);
        var s = Scan();
        Assert.Equal((1L, 0L), (s.DocumentsNew, s.PagesSeen));
    }

    [Fact]
    public void Small_batches_give_the_same_result_as_one_batch()
    {
        for (var i = 0; i < 20; i++)
        {
            Temp.Write($"a/d{i:00}.txt", $"common\nunique{i}");
        }

        var s = Scan(batchSize: 3);
        Assert.Equal((21L, 19L), (s.PagesNew, s.PagesReused));
        Assert.Equal(20, Catalog.Pages.Find(PageKey.Of("common"u8).Hex)!.References);
        foreach (var i in Enumerable.Range(0, 20))
        {
            File.Move(Temp.Combine($"a/d{i:00}.txt"), Temp.Combine($"a/moved-{i:00}.txt"));
        }

        s = Scan(batchSize: 3);
        Assert.Equal((0L, 0L, 20L), (s.PagesNew, s.PagesRemoved, s.DocumentsMoved));
        Assert.Equal(20, Catalog.Pages.Find(PageKey.Of("common"u8).Hex)!.References);
    }

    [Fact]
    public void A_selected_file_of_no_readable_type_is_counted_as_unsupported_and_a_refused_readable_name_as_a_fault()
    {
        Temp.Write("a/handover.txt", "p1\np2");
        Temp.Write("a/exports/readings.bin", "ALIEN bytes");
        Temp.Write("a/notes/garbled.txt", "ALIEN bytes under a readable name");
        var settings = new ScanSettings([new RootSpec("a", RootA, ["**/*"], [])], ReadLimits.Default, TimeSpan.Zero, BatchSize: 256);
        var s = new ScanPass(Catalog, Words, Reader, settings).Run("test", CancellationToken.None);

        Assert.Equal((3, 1, 1), (s.DocumentsSeen, s.DocumentsQuarantined, s.FilesUnsupported));
        Assert.Equal([new KeyValuePair<string, long>(".bin", 1)], s.UnsupportedTypes);
        Assert.Equal(2, Catalog.Documents.Quarantined().Count());
        Assert.Equal((1, 1), (Catalog.Figures().QuarantinedDocuments, Catalog.Figures().UnsupportedDocuments));
    }

    private ScanSummary Scan(int batchSize = 256)
    {
        Directory.CreateDirectory(RootA);
        var roots = new List<RootSpec> { new("a", RootA, [], []) };
        if (Directory.Exists(RootB) || Directory.Exists(Temp.Combine("b-unmounted")))
        {
            roots.Add(new RootSpec("b", RootB, [], []));
        }

        var settings = new ScanSettings(roots, ReadLimits.Default, TimeSpan.Zero, batchSize);
        return new ScanPass(Catalog, Words, Reader, settings).Run("test", CancellationToken.None);
    }
}
