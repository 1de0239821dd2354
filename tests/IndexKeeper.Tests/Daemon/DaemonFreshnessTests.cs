using IndexKeeper.Tests.EndToEnd;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Daemon;

/// <summary>
/// <c>indexkeeper run</c> end to end through the real process: files dropped in, edited, moved and deleted
/// under a watched root show up in search and the document list without any command being run.
/// </summary>
public sealed class DaemonFreshnessTests
{
    private static readonly string[] Fast = ["--root", "store", "--encoder", "hashed-terms", "--Detect:SettleSeconds=0.3", "--Daemon:SampleSeconds=0.5", "--Schedule:Windows:0=Mon-Sun 00:00-24:00"];

    [Fact]
    public void NewEditedMovedAndDeletedFilesReachTheIndex()
    {
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("store"));
        using var daemon = RunningDaemon.Start(temp.Path, Fast);

        // New: a document appears; its unique words become searchable.
        File.WriteAllBytes(temp.Combine("store", "ledger.pdf"), StorePdfs.Document("Quillfeather", 2));
        daemon.WaitUntil("the new document is searchable", () => daemon.SearchPaths("Quillfeather register").Contains("store/ledger.pdf"));

        // Edited: page 2 shows other words; the new words are found, the document is still one.
        File.WriteAllBytes(temp.Combine("store", "ledger.pdf"), StorePdfs.Document("Quillfeather", 2, editedPage: 2, editedLine: "Brindlecombe sluice gate overhaul"));
        daemon.WaitUntil("the edited page is searchable", () => daemon.SearchPaths("Brindlecombe sluice").Contains("store/ledger.pdf"));

        // Moved into a new folder: found at the new path only.
        Directory.CreateDirectory(temp.Combine("store", "archive"));
        File.Move(temp.Combine("store", "ledger.pdf"), temp.Combine("store", "archive", "ledger-2026.pdf"));
        daemon.WaitUntil("the moved document is found at its new path only", () =>
        {
            var hits = daemon.SearchPaths("Brindlecombe sluice");
            return hits.Contains("store/archive/ledger-2026.pdf") && !hits.Contains("store/ledger.pdf");
        });

        // Deleted: no document left, nothing found.
        File.Delete(temp.Combine("store", "archive", "ledger-2026.pdf"));
        daemon.WaitUntil("the deleted document is gone", () =>
            daemon.GetJson("/api/documents").GetProperty("total").GetInt64() == 0 && daemon.SearchPaths("Brindlecombe sluice").Count == 0);
        Assert.Equal(0, daemon.Terminate(RunningDaemon.Patience));
    }

    [Fact]
    public void ThousandsOfFilesAtOnceOverflowIntoAFullWalkThatCatchesEveryFile()
    {
        const int files = 2000;
        const int Distinct = 50;
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("store"));

        // A small bound on paths waiting to settle: the burst overflows it and the root is walked instead.
        using var daemon = RunningDaemon.Start(temp.Path, [.. Fast, "--Detect:MaxPendingPaths=100", "--Detect:WatcherBufferKilobytes=4"]);
        var scratch = Directory.CreateDirectory(temp.Combine("scratch")).FullName;
        var forms = Enumerable.Range(0, Distinct).Select(i => StorePdfs.Document($"intake{i:D2}", 1)).ToList();
        for (var i = 0; i < files; i++)
        {
            // Fifty distinct forms, each filed forty times: copies cost a hash, not a read, so the test
            // spends its time on notifications and walks rather than on parsing.
            File.WriteAllBytes(Path.Combine(scratch, $"form-{i:D4}.pdf"), forms[i % Distinct]);
        }

        // Moved in one by one as fast as the file system allows: a burst of notifications.
        Directory.CreateDirectory(temp.Combine("store", "intake"));
        foreach (var file in Directory.GetFiles(scratch))
        {
            File.Move(file, temp.Combine("store", "intake", Path.GetFileName(file)));
        }

        daemon.WaitUntil($"all {files} documents are in the catalog with vectors", () =>
        {
            var status = daemon.GetJson("/api/status");
            return status.GetProperty("documents").GetInt64() == files && status.GetProperty("queued").GetInt64() == 0;
        });
        var overflows = daemon.GetText("/metrics").Split('\n').Single(l => l.StartsWith("indexkeeper_watcher_overflows_total", StringComparison.Ordinal));
        Assert.False(overflows.EndsWith(" 0", StringComparison.Ordinal), "the burst should have overflowed the bound: " + overflows);
        var listed = daemon.GetJson("/api/documents?take=10000").GetProperty("documents").EnumerateArray().Select(d => d.GetProperty("path").GetString()).ToHashSet();
        Assert.All(Enumerable.Range(0, files), i => Assert.Contains($"intake/form-{i:D4}.pdf", listed));
        Assert.Contains("store/intake/form-0034.pdf", daemon.SearchPaths("intake34 register"));
        Assert.Equal(0, daemon.Terminate(RunningDaemon.Patience));
    }
}
