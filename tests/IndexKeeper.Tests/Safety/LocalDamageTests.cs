using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Index;
using IndexKeeper.Core.Storage;
using IndexKeeper.Tests.Crash;

namespace IndexKeeper.Tests.Safety;

/// <summary>
/// Damage stays local (docs/recovery.md): every record of a segment carries its own CRC-32C (RFC 3720 §B.4,
/// docs/segment-format.md), so a record that fails it costs that one vector set, and a closing record that
/// fails its own leaves every record it closes in service. Verify only reads; the explicit repair drops
/// what cannot be read and says so.
/// </summary>
public sealed class LocalDamageTests
{
    [Fact]
    public void One_flipped_bit_costs_one_vector_set_not_the_segment()
    {
        // Before: verify took the whole segment for damaged, moved it aside and forgot all its vector sets.
        using var directory = new Support.TempDirectory();
        var path = SealedIndex(directory.Path);
        using var index = new OpenIndex(directory.Path);
        var victim = index.Catalog.VectorSets.Live(OpenIndex.Encoder.Id)[3];
        FlipBit(path, victim.Offset + 60);
        var before = File.ReadAllBytes(path);

        var report = index.Verify();

        // Verify reports per file what is affected, and changes nothing.
        Assert.False(report.Clean);
        var damage = Assert.Single(report.Damage.Segments);
        Assert.Equal([victim.PageKey], damage.Pages);
        Assert.Equal(["test/notes/0.pdf"], damage.Documents);
        Assert.Null(damage.FileProblem);
        Assert.Equal(1, report.Damage.VectorSetsUnreadable);
        Assert.Contains(report.Problems, p => p.Contains("1 vector set(s) unreadable", StringComparison.Ordinal) && p.Contains("test/notes/0.pdf", StringComparison.Ordinal));
        Assert.Equal(before, File.ReadAllBytes(path));
        Assert.Equal(0, index.Catalog.Figures().Queued);

        // Search reads the seven others and names the one it could not read.
        using (var live = index.Store.OpenLive(OpenIndex.Encoder.Id))
        {
            Assert.Equal(7, live.Source.Count);
            Assert.Equal(victim.PageKey, Assert.Single(live.Unreadable).Record.PageKey);
            Assert.DoesNotContain(victim.PageKey, live.Records.Select(r => r.PageKey));
        }

        // The explicit repair drops that one vector set, queues its page again and says so.
        var repairs = DamageRepair.Run(index.Catalog, index.Store.Directory, report.Damage);
        Assert.Contains(repairs, r => r.StartsWith("segment 1: dropped 1 unreadable vector set(s)", StringComparison.Ordinal) && r.Contains("1 page(s) queued again", StringComparison.Ordinal));
        Assert.True(File.Exists(path));
        Assert.Equal(7, index.Readable().Count);
        Assert.Equal(1, index.Catalog.Figures().Queued);
        Assert.Equal(victim.PageKey, Assert.Single(index.Catalog.Queue.Keys()).PageKey);
    }

    [Fact]
    public void A_bad_closing_record_loses_nothing_and_repair_seals_it_again()
    {
        using var directory = new Support.TempDirectory();
        var path = SealedIndex(directory.Path);

        // The seal is the last 40 bytes; its file-crc sits 8 bytes before the end (docs/segment-format.md, "seal").
        FlipBit(path, new FileInfo(path).Length - 8);
        using var index = new OpenIndex(directory.Path);

        var report = index.Verify();

        Assert.False(report.Clean);
        var damage = Assert.Single(report.Damage.Segments);
        Assert.NotNull(damage.SealProblem);
        Assert.Empty(damage.VectorSetsUnreadable);
        Assert.Contains(report.Problems, p => p.Contains("nothing lost", StringComparison.Ordinal));
        Assert.Equal(8, index.Readable().Count);
        Assert.Equal(0, index.Catalog.Figures().Queued);

        var repairs = DamageRepair.Run(index.Catalog, index.Store.Directory, report.Damage);
        Assert.Equal(["segment 1: re-sealed (its records were intact; nothing dropped)"], repairs);
        using (var reader = SegmentReader.Open(path))
        {
            Assert.Equal(SegmentEnd.Sealed, reader.Scan().End);
        }

        Assert.True(index.Verify().Clean);
        Assert.Equal(8, index.Readable().Count);
    }

    [Fact]
    public void A_missing_segment_file_is_reported_by_a_read_and_nothing_is_forgotten()
    {
        // Before: status counted its vector sets, search answered no hits and verify said clean.
        using var directory = new Support.TempDirectory();
        var path = SealedIndex(directory.Path);
        File.SetAttributes(path, FileAttributes.Normal);
        File.Delete(path);
        using var index = new OpenIndex(directory.Path, readOnlyStore: true);

        var cheap = DamageSurvey.Run(index.Catalog, index.Store.Directory, OpenIndex.Encoder.Id, readRecords: false, CancellationToken.None);
        Assert.Equal(1, cheap.SegmentsMissing);
        Assert.Equal(8, cheap.VectorSetsUnreadable);
        Assert.Equal(8, cheap.PagesWithoutVectors);
        Assert.Equal(8, cheap.PagesWithoutVectorsNotQueued);

        var report = index.Verify();
        Assert.False(report.Clean);
        Assert.True(Assert.Single(report.Damage.Segments).Missing);
        using (var live = index.Store.OpenLive(OpenIndex.Encoder.Id))
        {
            Assert.Equal(0, live.Source.Count);
            Assert.Equal(8, live.Unreadable.Count);
        }

        Assert.Equal(8, index.Catalog.VectorSets.Count(liveOnly: true));
    }

    [Fact]
    public void The_samples_survey_sees_a_file_removed_after_a_clean_inspection_and_counts_as_the_full_one()
    {
        // The daemon's samples skip segments unchanged since a clean inspection: removing the file must end that.
        using var directory = new Support.TempDirectory();
        var path = SealedIndex(directory.Path);
        var clean = new CleanSegments();
        using (var index = new OpenIndex(directory.Path, readOnlyStore: true))
        {
            var intact = Running(index, clean);
            Assert.Empty(intact.Segments);
            Assert.Equal(0, intact.PagesWithoutVectors);
        }

        File.SetAttributes(path, FileAttributes.Normal);
        File.Delete(path);
        using (var index = new OpenIndex(directory.Path, readOnlyStore: true))
        {
            var running = Running(index, clean);
            var full = DamageSurvey.Run(index.Catalog, index.Store.Directory, OpenIndex.Encoder.Id, readRecords: false, CancellationToken.None);
            Assert.True(Assert.Single(running.Segments).Missing);
            Assert.Equal((full.SegmentsMissing, full.VectorSetsUnreadable, full.PagesWithoutVectors, full.PagesWithoutVectorsNotQueued), (running.SegmentsMissing, running.VectorSetsUnreadable, running.PagesWithoutVectors, running.PagesWithoutVectorsNotQueued));
            Assert.Equal(8, running.PagesWithoutVectorsNotQueued);
        }
    }

    [Fact]
    public void A_record_cut_in_the_middle_is_a_clean_end_of_an_open_segment()
    {
        using var directory = new Support.TempDirectory();
        string path;
        long committed;
        VectorSetRecord first;
        using (var index = new OpenIndex(directory.Path))
        {
            index.Add(Enumerable.Range(0, 3));
            index.Commit(Enumerable.Range(0, 3));
            var segment = Assert.Single(index.Catalog.Segments.All());
            path = SegmentFileNames.PathOf(index.Store.Directory, segment.Id);
            committed = segment.Length;
            first = index.Catalog.VectorSets.OfSegment(segment.Id).MinBy(v => v.Offset)!;
        }

        // A crash during the next append leaves half a record after the committed bytes.
        var extra = File.ReadAllBytes(path)[(int)first.Offset..(int)(first.Offset + (first.Length / 2))];
        using (var file = new FileStream(path, FileMode.Append))
        {
            file.Write(extra);
        }

        using (var reader = SegmentReader.Open(path))
        {
            var scan = reader.Scan();
            Assert.Equal(SegmentEnd.TornTail, scan.End);
            Assert.Equal(committed, scan.ValidLength);
        }

        using var reopened = new OpenIndex(directory.Path);
        Assert.Equal(committed, new FileInfo(path).Length);
        Assert.True(reopened.Verify().Clean);
        Assert.Equal(3, reopened.Readable().Count);
    }

    /// <summary>Eight pages with vectors in one sealed segment; returns the segment's path.</summary>
    private static string SealedIndex(string directory)
    {
        using var index = new OpenIndex(directory);
        index.Add(Enumerable.Range(0, 8));
        index.Commit(Enumerable.Range(0, 8));
        index.Store.SealAll();
        return SegmentFileNames.PathOf(index.Store.Directory, Assert.Single(index.Catalog.Segments.All()).Id);
    }

    private static void FlipBit(string path, long offset)
    {
        File.SetAttributes(path, File.GetAttributes(path) & ~FileAttributes.ReadOnly);
        using var file = new FileStream(path, FileMode.Open, FileAccess.ReadWrite);
        file.Position = offset;
        var value = file.ReadByte();
        file.Position = offset;
        file.WriteByte((byte)(value ^ 0x10));
    }

    private static DamageReport Running(OpenIndex index, CleanSegments clean)
    {
        index.Catalog.Counts.Refresh();
        var coverage = index.Catalog.Counts.Coverage(OpenIndex.Encoder.Id, OpenIndex.Encoder.Id);
        return DamageSurvey.RunRunning(index.Catalog, index.Store.Directory, OpenIndex.Encoder.Id, coverage, clean, CancellationToken.None);
    }
}
