using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Detect;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Pipeline;
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

    public UnreadableFileScanTests()
    {
        heldLock = IndexLock.Acquire(temp.Combine("index"), "test");
        catalog = IndexCatalog.Open(heldLock);
    }

    [LinuxFact]
    public void A_file_that_cannot_be_opened_is_counted_unreadable_and_kept_as_it_was()
    {
        temp.Write("a/m1.txt", "p1\np2");
        var locked = temp.Write("a/m2.txt", "p3");
        if (!OperatingSystem.IsWindows())
        {
            File.SetUnixFileMode(locked, UnixFileMode.None);
        }

        // As root every file opens; the pass runs as nobody (Unprivileged) to meet the permission error a user meets.
        var s = Unprivileged.Run(Scan);
        Assert.Equal((1L, 1L), (s.FilesUnreadable, s.DocumentsNew));
        Assert.Contains(s.Problems, p => p.Contains("m2.txt", StringComparison.Ordinal));
        Assert.Equal(0, Scan().FilesUnreadable);
    }

    public void Dispose()
    {
        catalog.Dispose();
        heldLock.Dispose();
        temp.Dispose();
    }

    private ScanSummary Scan()
    {
        var settings = new ScanSettings([new RootSpec("a", temp.Combine("a"), [], [])], ReadLimits.Default, TimeSpan.Zero, 256);
        return new ScanPass(catalog, reader, settings).Run("test", CancellationToken.None);
    }
}
