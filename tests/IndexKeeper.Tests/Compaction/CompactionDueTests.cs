using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Compaction;
using IndexKeeper.Core.Index;
using IndexKeeper.Tests.Crash;
using IndexKeeper.Tests.Storage;

namespace IndexKeeper.Tests.Compaction;

/// <summary>
/// The one rule of "compaction due" (docs/compaction.md): what <see cref="CompactionJobs.Due"/> reports
/// (the plan's forecast and the daemon's check) is what <see cref="VectorStore.Compact"/> then runs, also
/// when the work lies in a segment that is still open.
/// </summary>
public sealed class CompactionDueTests
{
    [Fact]
    public void Work_in_an_open_segment_is_due_and_is_what_compaction_runs()
    {
        using var directory = new Support.TempDirectory();
        using var index = new OpenIndex(directory.Path);
        var pages = Enumerable.Range(0, 8).ToList();
        index.Add(pages);
        index.Commit(pages);

        // The document goes: every vector set of the still open segment turns dead.
        var edit = new CatalogEdit();
        edit.DeleteDocuments.Add(DocumentRecord.MakeId("test", "notes/0.pdf"));
        edit.SetReferences.AddRange(pages.Select(p => (TestVectors.Key(p).Hex, 0)));
        index.Catalog.Apply(edit);
        index.Catalog.RemoveUnreferencedPages();
        var segment = Assert.Single(index.Catalog.Segments.All());
        Assert.False(segment.Sealed);
        Assert.Equal(0, segment.LiveRecordCount);

        var options = new CompactionOptions();
        var due = CompactionJobs.Due(index.Catalog, options);
        var job = Assert.Single(due);
        Assert.Equal(CompactionReason.Drop, job.Reason);
        Assert.Equal([segment.Id], job.SegmentIds);

        var report = index.Store.Compact(options, CancellationToken.None);
        Assert.Equal(due.Count, report.Jobs);
        Assert.Equal(due.Sum(j => j.SegmentIds.Count), report.SegmentsRewritten);
        Assert.Empty(index.Catalog.Segments.All());
        Assert.Empty(CompactionJobs.Due(index.Catalog, options));
    }
}
