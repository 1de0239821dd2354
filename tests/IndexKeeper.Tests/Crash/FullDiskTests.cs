using System.Text.Json;
using IndexKeeper.Tests.Support;
using Xunit.Abstractions;

namespace IndexKeeper.Tests.Crash;

/// <summary>
/// An index on a disk that fills up (a tiny tmpfs, so the kernel's ENOSPC is real). Segment disk full:
/// the batch that hits it fails and stays queued, what was committed before it stays, nothing is left for
/// recovery to repair, <c>verify</c> is clean, and once there is room again a sync carries on. Catalog
/// disk full: the command stops with a message and exit code 1 (the contract's partial failure), and
/// LiteDB's write-ahead log keeps every committed transaction.
/// </summary>
public sealed class FullDiskTests(ITestOutputHelper output)
{
    [TmpfsFact]
    public void A_full_segment_disk_fails_the_batch_cleanly_and_the_index_stays_consistent()
    {
        using var scratch = new TempDirectory();
        var (_, index, common) = Store(scratch, seed: 4242, documents: 12);
        string[] sync = ["sync", .. common, "--json", .. SyncSettings];

        // Disposed before the scratch folder, so the mount is gone before the folder is deleted.
        using var disk = TmpfsMount.Mount(Path.Combine(index, "segments"), 1536);
        var full = CliRunner.Run(scratch.Path, sync);
        var summary = JsonDocument.Parse(full.Stdout).RootElement;
        var embedded = summary.GetProperty("pagesEmbedded").GetInt64();
        var failed = summary.GetProperty("pagesFailed").GetInt64();
        var pages = summary.GetProperty("pagesNew").GetInt64();
        output.WriteLine($"full disk: exit {full.ExitCode}, {embedded} of {pages} pages embedded, {failed} failed: {string.Join("; ", summary.GetProperty("problems").EnumerateArray())}");
        Assert.Equal(1, full.ExitCode);
        Assert.True(embedded > 0 && failed > 0 && embedded + failed < pages, full.Stdout);

        // Failing cleanly: the store cut its own tail, so verify (which only reads) finds no problem and no damaged segment.
        var verify = CliRunner.Run(scratch.Path, ["verify", .. common, "--json"]);
        var report = JsonDocument.Parse(verify.Stdout).RootElement;
        output.WriteLine("verify after the full disk: " + verify.Stdout.ReplaceLineEndings(" "));
        Assert.Equal(0, verify.ExitCode);
        Assert.Empty(report.GetProperty("problems").EnumerateArray());
        Assert.True(report.GetProperty("damage").GetProperty("clean").GetBoolean(), verify.Stdout);
        var status = Status(scratch.Path, common);
        Assert.Equal(embedded, status.GetProperty("liveVectorSets").GetInt64());
        Assert.Equal(pages - embedded, status.GetProperty("queued").GetInt64());

        // Room again: the rest is embedded; the failed batch waits out its back-off in the queue.
        disk.Resize(32 * 1024);
        status = SyncAgainAndVerify(scratch.Path, sync, common);
        Assert.Equal(pages, status.GetProperty("pages").GetInt64());
        Assert.Equal(failed, status.GetProperty("queued").GetInt64());
        Assert.Equal(pages - failed, status.GetProperty("liveVectorSets").GetInt64());
    }

    [TmpfsFact]
    public void A_full_catalog_disk_stops_the_command_with_a_message_and_loses_nothing_committed()
    {
        using var scratch = new TempDirectory();
        var (churn, index, common) = Store(scratch, seed: 4343, documents: 6);
        string[] sync = ["sync", .. common, .. SyncSettings];

        // The whole index, catalog and segments, on one small disk.
        using var disk = TmpfsMount.Mount(index, 16 * 1024);
        var first = CliRunner.Run(scratch.Path, sync);
        Assert.True(first.ExitCode == 0, first.Stdout + first.Stderr);
        var committed = Status(scratch.Path, common).GetProperty("liveVectorSets").GetInt64();

        // More documents, and a filler that leaves the catalog 64 KiB to grow in.
        for (var i = 0; i < 6; i++)
        {
            churn.Add(5);
        }

        // Written, not just sized: a sparse file would take no room.
        var filler = Path.Combine(index, "filler");
        using (var stream = File.Create(filler))
        {
            var zeros = new byte[64 * 1024];
            for (var left = new DriveInfo(index).AvailableFreeSpace - zeros.Length; left > 0; left -= zeros.Length)
            {
                stream.Write(zeros, 0, (int)Math.Min(left, zeros.Length));
            }
        }

        var full = CliRunner.Run(scratch.Path, sync);
        output.WriteLine($"catalog disk full: exit {full.ExitCode}, stderr: {full.Stderr.ReplaceLineEndings(" ")}");
        Assert.Equal(1, full.ExitCode);
        Assert.DoesNotContain("Unhandled exception", full.Stderr, StringComparison.Ordinal);
        Assert.Contains("indexkeeper: ", full.Stderr, StringComparison.Ordinal);

        File.Delete(filler);
        var verify = CliRunner.Run(scratch.Path, ["verify", .. common, "--json"]);
        output.WriteLine("verify after the full disk: " + verify.Stdout.ReplaceLineEndings(" "));
        Assert.Equal(0, verify.ExitCode);
        var status = Status(scratch.Path, common);
        Assert.True(status.GetProperty("liveVectorSets").GetInt64() >= committed, $"{committed} vector sets were committed before the disk filled, {status.GetProperty("liveVectorSets")} are live after");

        status = SyncAgainAndVerify(scratch.Path, sync, common);
        Assert.Equal(60, status.GetProperty("pages").GetInt64());
        Assert.Equal(status.GetProperty("pages").GetInt64(), status.GetProperty("liveVectorSets").GetInt64() + status.GetProperty("queued").GetInt64());
    }

    // Small seals and batches, so a full disk meets a batch in the middle of the store.
    private static readonly string[] SyncSettings = ["--Storage:SealAtMegabytes=1", "--Encoder:BatchSize=4", "--Detect:SettleSeconds=0"];

    /// <summary>A store of five-page documents in the scratch folder and the arguments naming it and its index.</summary>
    private static (StoreChurn Churn, string Index, string[] Common) Store(TempDirectory scratch, int seed, int documents)
    {
        var store = scratch.Combine("store");
        var churn = new StoreChurn(store, seed);
        for (var i = 0; i < documents; i++)
        {
            churn.Add(5);
        }

        var index = scratch.Combine("index");
        return (churn, index, ["--index", index, "--root", store]);
    }

    /// <summary>With room again: the sync succeeds, verify is clean; the status that follows.</summary>
    private JsonElement SyncAgainAndVerify(string workingDirectory, string[] sync, string[] common)
    {
        var again = CliRunner.Run(workingDirectory, sync);
        Assert.True(again.ExitCode == 0, again.Stdout + again.Stderr);
        var clean = CliRunner.Run(workingDirectory, ["verify", .. common]);
        Assert.True(clean.ExitCode == 0, clean.Stdout);
        var status = Status(workingDirectory, common);
        output.WriteLine($"after room was made: {status.GetProperty("liveVectorSets")} live vector sets, {status.GetProperty("queued")} queued of {status.GetProperty("pages")} pages");
        return status;
    }

    private static JsonElement Status(string workingDirectory, string[] common) =>
        JsonDocument.Parse(CliRunner.Run(workingDirectory, ["status", .. common, "--json"]).Stdout).RootElement;
}
