using IndexKeeper.Core.Detect;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Pipeline;

namespace IndexKeeper.Tests.Pipeline;

/// <summary>
/// The plan's dry run against the real pass: for each kind of change, <see cref="ScanPass.Preview"/>
/// predicts exactly the figures the <see cref="ScanPass.Run"/> that follows reports, and leaves the
/// catalog as it was.
/// </summary>
public sealed class ScanPreviewTests : LinePageScenario
{
    public ScanPreviewTests()
    {
        Directory.CreateDirectory(Temp.Combine("a"));
        Directory.CreateDirectory(Temp.Combine("b"));
    }

    [Fact]
    public void Preview_predicts_each_pass_and_changes_nothing()
    {
        for (var i = 0; i < 8; i++)
        {
            Temp.Write($"a/reports/d{i}.txt", $"common\nunique{i}");
        }

        Temp.Write("a/manual.txt", "s1\ns2\ns3\ns4");
        Temp.Write("a/f1.txt", "k1\nk2");
        Temp.Write("a/f2.txt", "k2\nk9");
        var first = Check();
        Assert.Equal(ChangeKind.New, Assert.Single(first.Changes, c => c.Path == "f1.txt").Kind);

        // Copy, rename, move across roots, delete the only holder of a page, insert and reorder pages.
        File.Copy(Temp.Combine("a/reports/d0.txt"), Temp.Combine("a/copy-of-d0.txt"));
        File.Move(Temp.Combine("a/reports/d1.txt"), Temp.Combine("a/reports/renamed.txt"));
        File.Move(Temp.Combine("a/reports/d2.txt"), Temp.Combine("b/d2.txt"));
        File.Delete(Temp.Combine("a/f1.txt"));
        File.WriteAllText(Temp.Combine("a/manual.txt"), "s3\ns1\nINSERTED\ns2\ns4");
        var second = Check();
        Assert.Contains(PageKey.Of("k1"u8).Hex, second.RemovedKeys);
        Assert.Equal([PageKey.Of("INSERTED"u8).Hex], second.NewKeys);
        var manual = Assert.Single(second.Changes, c => c.Path == "manual.txt");
        Assert.Equal((ChangeKind.Changed, 1, 4), (manual.Kind, manual.PagesToEmbed, manual.PagesFree));
        Assert.Equal(ChangeKind.Copied, Assert.Single(second.Changes, c => c.Path == "copy-of-d0.txt").Kind);
        Assert.Equal(ChangeKind.Deleted, Assert.Single(second.Changes, c => c.Path == "f1.txt").Kind);

        // Everything moved in small batches: nothing new, nothing removed.
        foreach (var i in new[] { 3, 4, 5, 6, 7 })
        {
            File.Move(Temp.Combine($"a/reports/d{i}.txt"), Temp.Combine($"a/moved-{i}.txt"));
        }

        var third = Check();
        Assert.Empty(third.NewKeys);
        Assert.Empty(third.RemovedKeys);
    }

    /// <summary>Previews, checks the catalog did not move, runs the real pass and compares the figures.</summary>
    private ScanPreview Check()
    {
        var settings = new ScanSettings([new RootSpec("a", Temp.Combine("a"), [], []), new RootSpec("b", Temp.Combine("b"), [], [])], ReadLimits.Default, TimeSpan.Zero, BatchSize: 3);
        var before = Snapshot();
        var preview = new ScanPass(Catalog, Words, Reader, settings).Preview(CancellationToken.None);
        Assert.Equal(before, Snapshot());

        var real = new ScanPass(Catalog, Words, Reader, settings).Run("test", CancellationToken.None);
        var p = preview.Summary;
        Assert.Equal(
            (real.DocumentsNew, real.DocumentsChanged, real.DocumentsDeleted, real.DocumentsCopied, real.DocumentsMoved, real.DocumentsUnchanged),
            (p.DocumentsNew, p.DocumentsChanged, p.DocumentsDeleted, p.DocumentsCopied, p.DocumentsMoved, p.DocumentsUnchanged));
        Assert.Equal((real.PagesNew, real.PagesReused, real.PagesRemoved), (p.PagesNew, p.PagesReused, p.PagesRemoved));
        Assert.Equal(real.PagesNew, preview.NewKeys.Count);
        Assert.Equal(real.PagesNew, preview.Changes.Sum(c => c.PagesToEmbed));
        Assert.Equal(real.PagesReused, preview.Changes.Sum(c => c.PagesFree));
        return preview;
    }

    private string Snapshot()
    {
        var documents = Catalog.Documents.All().OrderBy(d => d.Id, StringComparer.Ordinal).Select(d => $"{d.Id}:{d.FileHash}:{d.ModifiedTicksUtc}:{string.Join(',', d.PageKeys)}");
        var pages = Catalog.Pages.All().OrderBy(p => p.Id, StringComparer.Ordinal).Select(p => $"{p.Id}:{p.References}");
        var queue = Catalog.Queue.InOrder().OrderBy(q => q.Id, StringComparer.Ordinal).Select(q => q.Id);
        return string.Join('\n', documents.Concat(pages).Concat(queue)) + $"\nscans:{Catalog.Figures().LastScanUtc}";
    }
}
