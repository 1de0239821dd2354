using IndexKeeper.Core.Index;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Tests.Crash;

/// <summary>
/// Damage to what the catalog committed is reported and left to the explicit <c>repair</c>: a writing open
/// never cuts committed bytes to append after them, and never forgets the vector sets of a missing file.
/// </summary>
public sealed class CommittedDamageTests
{
    [Fact]
    public void An_open_segment_whose_committed_tail_reads_as_torn_refuses_appends_and_keeps_its_bytes()
    {
        using var directory = new Support.TempDirectory();
        string path;
        long lastOffset;
        using (var index = new OpenIndex(directory.Path))
        {
            index.Add(Enumerable.Range(0, 12));
            index.Commit(Enumerable.Range(0, 4));
            index.Commit(Enumerable.Range(4, 4));
            var segment = Assert.Single(index.Catalog.Segments.All());
            path = SegmentFileNames.PathOf(index.Store.Directory, segment.Id);
            lastOffset = index.Catalog.VectorSets.OfSegment(segment.Id).Max(v => v.Offset);
        }

        // A bad block zeroes the last committed record: a scan alone cannot tell it from a never-written tail.
        var bytes = File.ReadAllBytes(path);
        Array.Clear(bytes, (int)lastOffset, bytes.Length - (int)lastOffset);
        File.SetAttributes(path, FileAttributes.Normal);
        File.WriteAllBytes(path, bytes);

        using (var index = new OpenIndex(directory.Path))
        {
            var refused = Assert.Throws<SegmentFormatException>(() => index.Commit(Enumerable.Range(8, 4)));
            Assert.Contains("cannot append", refused.Message, StringComparison.Ordinal);
            Assert.Equal(bytes, File.ReadAllBytes(path));
            Assert.Equal(8, index.Catalog.VectorSets.Count(liveOnly: true));
            Assert.False(index.Verify().Clean);
        }
    }

    [Fact]
    public void A_writing_open_keeps_the_vector_sets_of_a_missing_segment_and_reports_them()
    {
        using var directory = new Support.TempDirectory();
        string path;
        using (var index = new OpenIndex(directory.Path))
        {
            index.Add(Enumerable.Range(0, 12));
            index.Commit(Enumerable.Range(0, 4));
            index.Commit(Enumerable.Range(4, 4));
            path = SegmentFileNames.PathOf(index.Store.Directory, Assert.Single(index.Catalog.Segments.All()).Id);
        }

        File.SetAttributes(path, FileAttributes.Normal);
        File.Delete(path);
        using var reopened = new OpenIndex(directory.Path);
        Assert.Contains(reopened.Store.Repairs, r => r.Contains("is missing", StringComparison.Ordinal));
        Assert.Equal(8, reopened.Catalog.VectorSets.Count(liveOnly: true));
        Assert.Equal(4, reopened.Catalog.Figures().Queued);
        var report = reopened.Verify();
        Assert.True(Assert.Single(report.Damage.Segments).Missing);
        Assert.Equal(8, report.Damage.VectorSetsUnreadable);

        // New vectors go to a new segment; the missing one stays named until `repair` drops it.
        reopened.Commit(Enumerable.Range(8, 4));
        Assert.Equal(2, reopened.Catalog.Segments.All().Count);
        Assert.Equal(4, reopened.Readable().Count);
        Assert.Equal(12, reopened.Catalog.VectorSets.Count(liveOnly: true));
    }
}
