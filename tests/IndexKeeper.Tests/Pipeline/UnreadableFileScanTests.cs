using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Detect;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Pipeline;
using IndexKeeper.Core.Storage;
using IndexKeeper.Tests.Detect;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Pipeline;

/// <summary>A file of a root that cannot be opened is counted in <see cref="ScanSummary.FilesUnreadable"/> (sync and scan then exit 1) and its entry kept.</summary>
public sealed class UnreadableFileScanTests : IDisposable
{
    private readonly TempDirectory temp = new();
    private readonly LinePageReader reader = new();
    private readonly IndexLock heldLock;
    private readonly IndexCatalog catalog;
    private readonly PageWordStore words;

    public UnreadableFileScanTests()
    {
        heldLock = IndexLock.Acquire(temp.Combine("index"), "test");
        catalog = IndexCatalog.Open(heldLock);
        words = PageWordStore.OpenForWriting(temp.Combine("index"));
    }

    [LinuxFact]
    public void A_file_that_cannot_be_opened_is_counted_unreadable_and_kept_as_it_was()
    {
        temp.Write("a/m1.txt", "p1\np2");
        var locked = temp.Write("a/m2.txt", "p3");
        if (!OperatingSystem.IsWindows())
        {
            File.SetUnixFileMode(locked, UnixFileMode.None);

            // The catalog is already open; the page-word store makes its file during the pass, so nobody may.
            Directory.CreateDirectory(temp.Combine("index", "words"));
            File.SetUnixFileMode(temp.Combine("index", "words"), (UnixFileMode)0b111_111_111);
        }

        // As root every file opens; the pass runs as nobody (Unprivileged) to meet the permission error a user meets.
        var s = Unprivileged.Run(Scan);
        Assert.Equal((1L, 1L), (s.FilesUnreadable, s.DocumentsNew));
        Assert.Contains(s.Problems, p => p.Contains("m2.txt", StringComparison.Ordinal));
        Assert.Equal(0, Scan().FilesUnreadable);
    }

    public void Dispose()
    {
        words.Dispose();
        catalog.Dispose();
        heldLock.Dispose();
        temp.Dispose();
    }

    private ScanSummary Scan()
    {
        var settings = new ScanSettings([new RootSpec("a", temp.Combine("a"), [], [])], ReadLimits.Default, TimeSpan.Zero, 256);
        return new ScanPass(catalog, words, reader, settings).Run("test", CancellationToken.None);
    }
}
