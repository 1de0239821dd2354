using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Index;
using IndexKeeper.Core.Storage;
using IndexKeeper.Tests.Storage;

namespace IndexKeeper.Tests.Crash;

/// <summary>
/// The states a kill can leave, made on purpose, for those a random kill seldom hits (the window between
/// a seal's write and its catalog record lasts about a millisecond here): each is repaired at open,
/// reported as a repair, loses no committed vector set, and the index verifies and takes more appends.
/// </summary>
public sealed class RecoveryStateTests
{
    [Fact]
    public void A_seal_the_catalog_never_recorded_is_cut_and_the_segment_takes_more_records()
    {
        using var directory = new Support.TempDirectory();
        var segment = Prepare(directory.Path, committed: 8, queued: 4);
        using (var writer = SegmentWriter.Reopen(segment))
        {
            writer.Seal();
        }

        using var index = new OpenIndex(directory.Path);
        var id = Assert.Single(index.Catalog.Segments.All()).Id;
        Assert.Equal([$"cut {SegmentFormat.SealRecordLength} uncommitted bytes from open segment {id}"], index.Store.Repairs);
        Assert.True(OperatingSystem.IsWindows() || (File.GetUnixFileMode(segment) & UnixFileMode.UserWrite) != 0, "the cut segment is still read-only, so the store cannot append to it");
        AssertServes(index, committed: 8, queued: 4);
        index.Commit(Enumerable.Range(8, 4));
        Assert.Equal(id, Assert.Single(index.Catalog.Segments.All()).Id);
        AssertServes(index, committed: 12, queued: 0);
    }

    [Fact]
    public void Records_made_durable_but_never_committed_are_cut_and_stay_queued()
    {
        using var directory = new Support.TempDirectory();
        var segment = Prepare(directory.Path, committed: 8, queued: 4);
        using (var writer = SegmentWriter.Reopen(segment))
        {
            writer.Append(TestVectors.Key(8), TestVectors.Set(8, 12));
            writer.Append(TestVectors.Key(9), TestVectors.Set(9, 12));
            writer.Flush(durable: true);
        }

        using var index = new OpenIndex(directory.Path);
        Assert.StartsWith("cut ", Assert.Single(index.Store.Repairs), StringComparison.Ordinal);
        AssertServes(index, committed: 8, queued: 4);
    }

    [Fact]
    public void A_torn_last_record_is_cut()
    {
        using var directory = new Support.TempDirectory();
        var segment = Prepare(directory.Path, committed: 8, queued: 4);
        var whole = File.ReadAllBytes(segment);
        using (var writer = SegmentWriter.Reopen(segment))
        {
            writer.Append(TestVectors.Key(8), TestVectors.Set(8, 12));
        }

        // Half of the appended record reached the disk.
        var torn = File.ReadAllBytes(segment);
        File.WriteAllBytes(segment, torn[..(whole.Length + ((torn.Length - whole.Length) / 2))]);
        using var index = new OpenIndex(directory.Path);
        Assert.Equal([$"cut {(torn.Length - whole.Length) / 2} uncommitted bytes from open segment {Assert.Single(index.Catalog.Segments.All()).Id}"], index.Store.Repairs);
        AssertServes(index, committed: 8, queued: 4);
    }

    [Fact]
    public void Orphan_segments_are_set_aside_and_unfinished_compaction_outputs_removed()
    {
        using var directory = new Support.TempDirectory();
        Prepare(directory.Path, committed: 8, queued: 0);
        var segments = Path.Combine(directory.Path, VectorStore.SegmentsFolder);

        // A segment created just before a kill, never committed; and a compaction output killed before its seal.
        SegmentWriter.Create(segments, new SegmentHeader(900, OpenIndex.Encoder.Id, 64, DateTimeOffset.UtcNow)).Dispose();
        File.WriteAllBytes(SegmentFileNames.TempPathOf(segments, 901), new SegmentHeader(901, OpenIndex.Encoder.Id, 64, DateTimeOffset.UtcNow).Encode());
        using var index = new OpenIndex(directory.Path);
        Assert.Equal(
            [$"moved segment {SegmentFileNames.Name(900)}, which no catalog commit references, to orphaned/{SegmentFileNames.Name(900)}", $"removed unfinished compaction output {SegmentFileNames.TempName(901)}"],
            index.Store.Repairs.Order(StringComparer.Ordinal));
        Assert.Equal([SegmentFileNames.PathOf(segments, index.Catalog.Segments.All()[0].Id)], Directory.GetFiles(segments));
        Assert.Equal([Path.Combine(segments, "orphaned", SegmentFileNames.Name(900))], Directory.GetFiles(Path.Combine(segments, "orphaned")));
        AssertServes(index, committed: 8, queued: 0);
    }

    [Fact]
    public void A_store_opened_for_reading_repairs_nothing_and_still_serves()
    {
        using var directory = new Support.TempDirectory();
        var segment = Prepare(directory.Path, committed: 8, queued: 4);
        var segments = Path.GetDirectoryName(segment)!;

        // What a crash leaves: an uncommitted tail and an orphan. A reader must see the committed state and change no byte.
        using (var writer = SegmentWriter.Reopen(segment))
        {
            writer.Append(TestVectors.Key(8), TestVectors.Set(8, 12));
        }

        SegmentWriter.Create(segments, new SegmentHeader(900, OpenIndex.Encoder.Id, 64, DateTimeOffset.UtcNow)).Dispose();
        var before = Directory.GetFiles(segments).Order(StringComparer.Ordinal).Select(f => (f, Convert.ToHexString(File.ReadAllBytes(f)))).ToList();
        using (var held = ReaderGate.EnterShared(directory.Path))
        using (var catalog = IndexCatalog.OpenReadOnly(held))
        using (var store = VectorStore.OpenForReading(catalog, directory.Path))
        {
            Assert.Empty(store.Repairs);
            using (var live = store.OpenLive(OpenIndex.Encoder.Id))
            {
                Assert.Equal(8, live.Source.Count);
            }

            Assert.Throws<InvalidOperationException>(() => store.AppendAndCommit(OpenIndex.Encoder, [(TestVectors.Key(9), TestVectors.Set(9, 12))]));
            Assert.Throws<InvalidOperationException>(store.SealAll);
        }

        Assert.Equal(before, Directory.GetFiles(segments).Order(StringComparer.Ordinal).Select(f => (f, Convert.ToHexString(File.ReadAllBytes(f)))).ToList());
    }

    /// <summary>Pages 0.. of which the first <paramref name="committed"/> get vectors; returns the open segment's path, closed cleanly.</summary>
    private static string Prepare(string directory, int committed, int queued)
    {
        using var index = new OpenIndex(directory);
        index.Add(Enumerable.Range(0, committed + queued));
        foreach (var batch in Enumerable.Range(0, committed).Chunk(4))
        {
            index.Commit(batch);
        }

        var segment = Assert.Single(index.Catalog.Segments.All());
        Assert.False(segment.Sealed);
        return SegmentFileNames.PathOf(index.Store.Directory, segment.Id);
    }

    private static void AssertServes(OpenIndex index, int committed, int queued)
    {
        var report = index.Verify();
        Assert.True(report.Clean, string.Join("\n", report.Problems));
        Assert.Equal(Enumerable.Range(0, committed).Select(p => TestVectors.Key(p).Hex).Order(), index.Readable().Order());
        Assert.Equal(queued, index.Catalog.Figures().Queued);
    }
}
