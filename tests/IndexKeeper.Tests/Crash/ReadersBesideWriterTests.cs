using System.Diagnostics;
using System.Text.Json;
using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Faults;
using IndexKeeper.Core.Index;
using IndexKeeper.Tests.EndToEnd;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Crash;

/// <summary>
/// Read commands run beside one writer and see its last commit (docs/catalog.md, "Readers beside a writer").
/// The writer is stopped at a named I/O point by the <c>pause</c> fault action, so what each side has done
/// is fixed by the test, never by timing.
/// </summary>
public sealed class ReadersBesideWriterTests
{
    private static readonly string[] Encoder = ["--encoder", "hashed-terms"];

    [Fact]
    public void Status_search_and_verify_run_while_a_sync_is_stopped_mid_write_and_see_the_last_commit()
    {
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("store"));
        File.WriteAllBytes(temp.Combine("store", "ferry-timetable.pdf"), StorePdfs.Document("Gullstone", 2));
        string[] common = ["--index", "index", "--root", "store", .. Encoder];
        Assert.Equal(0, CliRunner.Run(temp.Path, ["sync", .. common]).ExitCode);

        // The new document's vectors are durable in the open segment but not committed when the writer stops.
        File.WriteAllBytes(temp.Combine("store", "quay-ledger.pdf"), StorePdfs.Document("Marrowick", 2));
        var resume = temp.Combine("resume");
        using var writer = StartPaused(temp.Path, FaultPoints.SegmentAppendAfterFsync, resume, ["sync", .. common]);

        var status = CliRunner.Run(temp.Path, "status", "--index", "index", "--json");
        Assert.True(status.ExitCode == 0, status.Stderr);
        var figures = JsonDocument.Parse(status.Stdout).RootElement;
        Assert.Equal(2, figures.GetProperty("documents").GetInt64());
        Assert.Equal(2, figures.GetProperty("liveVectorSets").GetInt64());
        Assert.Equal(2, figures.GetProperty("queued").GetInt64());

        var old = CliRunner.Run(temp.Path, ["search", "Gullstone register", "--index", "index", .. Encoder]);
        Assert.True(old.ExitCode == 0, old.Stderr);
        Assert.Contains("ferry-timetable.pdf", old.Stdout, StringComparison.Ordinal);
        var uncommitted = CliRunner.Run(temp.Path, ["search", "Marrowick register", "--index", "index", .. Encoder]);
        Assert.True(uncommitted.ExitCode == 0, uncommitted.Stderr);
        Assert.DoesNotContain("quay-ledger.pdf", uncommitted.Stdout, StringComparison.Ordinal);

        var verify = CliRunner.Run(temp.Path, ["verify", "--index", "index", "--json", .. Encoder]);
        Assert.True(verify.ExitCode == 0, verify.Stdout + verify.Stderr);
        Assert.Equal(0, JsonDocument.Parse(verify.Stdout).RootElement.GetProperty("problems").GetArrayLength());

        File.WriteAllText(resume, string.Empty);
        Assert.Equal(0, Finish(writer));
        var after = CliRunner.Run(temp.Path, ["search", "Marrowick register", "--index", "index", .. Encoder]);
        Assert.Contains("quay-ledger.pdf", after.Stdout, StringComparison.Ordinal);
    }

    [Fact]
    public void A_reader_beside_the_first_sync_finds_no_index_yet_never_a_half_made_catalog()
    {
        // Before: the first sync created catalog.db in place, and a status at that moment could open a file
        // LiteDB had not finished ("catalog cannot be read", exit 1).
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("store"));
        File.WriteAllBytes(temp.Combine("store", "ferry-timetable.pdf"), StorePdfs.Document("Gullstone", 2));
        var resume = temp.Combine("resume");
        using var writer = StartPaused(temp.Path, FaultPoints.CatalogCreateRename, resume, ["sync", "--index", "index", "--root", "store", .. Encoder]);

        Assert.False(File.Exists(temp.Combine("index", CatalogSchema.FileName)));
        var status = CliRunner.Run(temp.Path, "status", "--index", "index");
        Assert.True(status.ExitCode == 2, status.Stdout + status.Stderr);
        Assert.Contains("no index", status.Stderr, StringComparison.Ordinal);

        File.WriteAllText(resume, string.Empty);
        Assert.Equal(0, Finish(writer));
        Assert.False(File.Exists(temp.Combine("index", CatalogSchema.CreatingFileName)));
        Assert.Equal(0, CliRunner.Run(temp.Path, "status", "--index", "index").ExitCode);
    }

    [Fact]
    public void A_creation_that_crashed_before_its_rename_is_made_again()
    {
        using var temp = new TempDirectory();
        File.WriteAllText(temp.Combine(CatalogSchema.CreatingFileName), "left by a creation that crashed");
        using (var held = IndexLock.Acquire(temp.Path, "writer"))
        using (var catalog = IndexCatalog.Open(held))
        {
            Assert.Empty(catalog.Documents.All());
        }

        Assert.False(File.Exists(temp.Combine(CatalogSchema.CreatingFileName)));
        Assert.True(File.Exists(temp.Combine(CatalogSchema.FileName)));
    }

    [Fact]
    public void A_writer_closing_while_a_reader_is_open_leaves_the_catalog_log_for_later()
    {
        using var temp = new TempDirectory();
        using (var held = IndexLock.Acquire(temp.Path, "writer"))
        using (var catalog = IndexCatalog.Open(held))
        {
            catalog.History.RecordEmbedding("enc-a", DateTime.UtcNow, 1.0, pagesEmbedded: 1, vectorsWritten: 2, encoderSeconds: 0.5);
        }

        var log = Path.Combine(temp.Path, CatalogSchema.LogFileName);
        Assert.False(File.Exists(log), "with no reader open the writer folds its log at close");
        using (var gate = ReaderGate.EnterShared(temp.Path))
        using (var reader = IndexCatalog.OpenReadOnly(gate))
        {
            using (var held = IndexLock.Acquire(temp.Path, "writer"))
            using (var catalog = IndexCatalog.Open(held))
            {
                catalog.History.RecordEmbedding("enc-a", DateTime.UtcNow, 2.0, pagesEmbedded: 7, vectorsWritten: 9, encoderSeconds: 0.5);
            }

            // LiteDB's checkpoint at close would have rewritten the data file under the open reader.
            Assert.True(File.Exists(log) && new FileInfo(log).Length > 0);
            Assert.Single(reader.History.Embeds("enc-a", 20));
        }

        using (var gate = ReaderGate.EnterShared(temp.Path))
        using (var reader = IndexCatalog.OpenReadOnly(gate))
        {
            Assert.Equal(2, reader.History.Embeds("enc-a", 20).Count);
        }
    }

    [Fact]
    public void Compaction_keeps_the_old_segments_for_a_reader_that_opened_before_the_swap()
    {
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("store"));
        for (var i = 0; i < 4; i++)
        {
            File.WriteAllBytes(temp.Combine("store", $"ledger-{i}.pdf"), StorePdfs.Document("Skelloway" + i, 3));
        }

        string[] common = ["--index", "index", "--root", "store", .. Encoder];

        // As in the fault matrix: every segment counts as small and a low dead share gives compaction work.
        string[] compactSettings = ["--Storage:SealAtMegabytes=16", "--Storage:SmallSegmentMegabytes=16", "--Storage:CompactDeadShare=0.05"];
        Assert.Equal(0, CliRunner.Run(temp.Path, ["sync", .. common]).ExitCode);
        File.Delete(temp.Combine("store", "ledger-0.pdf"));
        Assert.Equal(0, CliRunner.Run(temp.Path, ["sync", .. common]).ExitCode);
        var segments = temp.Combine("index", "segments");
        var before = Directory.GetFiles(segments).Order(StringComparer.Ordinal).ToList();

        using (var gate = ReaderGate.EnterShared(temp.Combine("index")))
        using (var catalog = IndexCatalog.OpenReadOnly(gate))
        using (var store = VectorStore.OpenForReading(catalog, temp.Combine("index")))
        {
            var encoderId = Assert.Single(catalog.Encoders.All()).Id;
            var compact = CliRunner.Run(temp.Path, ["compact", .. common, .. compactSettings]);
            Assert.True(compact.ExitCode == 0, compact.Stdout + compact.Stderr);
            Assert.NotEqual(before, Directory.GetFiles(segments).Order(StringComparer.Ordinal).ToList());
            Assert.All(before, path => Assert.True(File.Exists(path), path + " was deleted under an open reader"));

            // The reader's catalog still names the old segments; every one of its vector sets reads.
            using var live = store.OpenLive(encoderId);
            Assert.Empty(live.Unreadable);
            Assert.Equal(9, live.Source.Count);

            var verify = CliRunner.Run(temp.Path, ["verify", "--index", "index", "--json", .. Encoder]);
            Assert.True(verify.ExitCode == 0, verify.Stdout + verify.Stderr);
            Assert.Contains("retired by a compaction", verify.Stdout, StringComparison.Ordinal);
        }

        // With no reader open, the next writing open deletes what the swap retired.
        Assert.Equal(0, CliRunner.Run(temp.Path, ["sync", .. common]).ExitCode);
        Assert.Contains(before, path => !File.Exists(path));
        var clean = CliRunner.Run(temp.Path, ["verify", "--index", "index", "--json", .. Encoder]);
        Assert.DoesNotContain("retired by a compaction", clean.Stdout, StringComparison.Ordinal);
    }

    /// <summary>Starts a command armed to pause at <paramref name="point"/> and returns once it has stopped there.</summary>
    private static Process StartPaused(string directory, string point, string resume, string[] args)
    {
        var start = CliRunner.StartInfo(directory, args);
        start.Environment[FaultInjection.Variable] = point + ":pause";
        start.Environment[FaultInjection.ResumeVariable] = resume;
        var process = Process.Start(start)!;
        while (process.StandardError.ReadLine() is { } line)
        {
            if (line.StartsWith(FaultInjection.FiredMarker, StringComparison.Ordinal))
            {
                return process;
            }
        }

        process.WaitForExit();
        throw new InvalidOperationException($"the command ended (exit {process.ExitCode}) without reaching {point}: {process.StandardOutput.ReadToEnd()}");
    }

    private static int Finish(Process process)
    {
        var stdout = process.StandardOutput.ReadToEndAsync();
        var stderr = process.StandardError.ReadToEndAsync();
        if (!process.WaitForExit(TimeSpan.FromMinutes(5)))
        {
            process.Kill(entireProcessTree: true);
            throw new TimeoutException("the resumed command did not finish in 5 minutes");
        }

        Assert.True(process.ExitCode == 0, stdout.Result + stderr.Result);
        return process.ExitCode;
    }
}
