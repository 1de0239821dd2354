using System.Globalization;
using System.Text;
using System.Text.Json;
using System.Text.RegularExpressions;
using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Faults;
using IndexKeeper.Core.Storage;
using IndexKeeper.Tests.Support;
using Xunit.Abstractions;

namespace IndexKeeper.Tests.Crash;

/// <summary>
/// Crash tests by fault injection, never by timing: the real executable runs <c>sync</c> or <c>compact</c>
/// with a fault armed at the Nth reach of a named I/O point (<see cref="FaultPoints"/>): <c>exit</c> ends
/// the process there as a kill would, <c>enospc</c> and <c>eio</c> fail the I/O as a full or failing disk
/// does. After each: the command's exit code and message are honest (no stack trace), <c>verify</c> passes
/// with only the repairs a crash may need, every vector set committed before is still live unless its page
/// is gone, a search serves, the next <c>sync</c> completes and <c>verify</c> is then clean. Every point must
/// fire at least once. The rows make docs/fault-matrix.md; the test fails when the committed document
/// differs (write it again with <c>IK_WRITE_FAULT_MATRIX=1 dotnet test … --filter FaultMatrixTests</c>).
/// </summary>
public sealed partial class FaultMatrixTests(ITestOutputHelper output)
{
    public const string WriteVariable = "IK_WRITE_FAULT_MATRIX";

    // What a crash may leave for the next writing open to tidy; verify lists these as notes (IndexVerifier).
    private const string TempLeftover = "unfinished compaction output";
    private const string SegmentLeftover = "is not referenced by the catalog";
    private const string RetiredLeftover = "retired by a compaction";

    // One sync segment seals after a few pages; compaction outputs up to 16 MiB; every segment counts as
    // small and a low dead share gives compaction work (as the demo's crash settings did before).
    private static readonly string[] SyncSettings = ["--Storage:SealAtMegabytes=1", "--Encoder:BatchSize=4", "--Detect:SettleSeconds=0"];
    private static readonly string[] CompactSettings = ["--Storage:SealAtMegabytes=16", "--Storage:SmallSegmentMegabytes=16", "--Storage:CompactDeadShare=0.05"];

    private sealed record Row(FaultScenario Scenario, bool Fired, int ExitCode, string Message, int LiveBefore, int LiveAfter, string Leftovers, long QueuedAfterNextSync);

    [Fact]
    public void Every_fault_point_with_every_fault_leaves_an_index_that_verifies_serves_and_syncs()
    {
        using var scratch = new TempDirectory();
        var template = scratch.Combine("template");
        var (known, pending) = BuildTemplate(template);

        var scenarios = FaultScenario.All;
        var rows = new Row[scenarios.Count];

        // Two at a time: each scenario has a copy of its own, and the outcome of one never depends on timing.
        Parallel.For(0, scenarios.Count, new ParallelOptions { MaxDegreeOfParallelism = 2 }, i =>
            rows[i] = Run(scenarios[i], template, scratch.Combine("s" + i.ToString("000", CultureInfo.InvariantCulture)), known, pending));

        foreach (var row in rows)
        {
            output.WriteLine($"{row.Scenario.Name}: {(row.Fired ? "fired" : "not reached")}, exit {row.ExitCode}, live {row.LiveBefore} → {row.LiveAfter}, left: {row.Leftovers}, queued after next sync {row.QueuedAfterNextSync}; {row.Message}");
        }

        var reached = rows.Where(r => r.Fired).Select(r => r.Scenario.Point).ToHashSet(StringComparer.Ordinal);
        var never = FaultPoints.All.Where(p => !reached.Contains(p)).ToList();
        Assert.True(never.Count == 0, "fault points no scenario reached: " + string.Join(", ", never));

        var document = Render(rows);
        var path = Path.Combine(RepositoryRoot.Path, "docs", "fault-matrix.md");
        if (Environment.GetEnvironmentVariable(WriteVariable) == "1")
        {
            File.WriteAllText(path, document);
        }

        var committed = File.Exists(path) ? File.ReadAllText(path).ReplaceLineEndings("\n") : "";
        Assert.True(
            committed == document,
            $"docs/fault-matrix.md differs from what this run produced; write it again with {WriteVariable}=1 dotnet test IndexKeeper.sln -c Release --no-build --filter FullyQualifiedName~FaultMatrixTests");
    }

    /// <summary>
    /// A synced store with dead vector sets (compaction has work) and new documents not yet synced (sync has
    /// work). Returns a phrase of a synced page and one of a pending page, each with its document and page.
    /// </summary>
    private static ((string Phrase, string Path, int Page) Known, (string Phrase, string Path, int Page) Pending) BuildTemplate(string template)
    {
        var store = Path.Combine(template, "store");
        var churn = new StoreChurn(store, 31337);
        for (var i = 0; i < 8; i++)
        {
            churn.Add(3);
        }

        var known = churn.LastUnique!.Value;
        string[] common = ["--index", Path.Combine(template, "index"), "--root", store];
        MustSucceed(CliRunner.Run(template, ["sync", .. common, .. SyncSettings]));

        // Two documents go and one comes: their vector sets die inside sealed segments.
        File.Delete(Path.Combine(store, "reports", "churn", "HWA-CR-000 field note.pdf"));
        File.Delete(Path.Combine(store, "reports", "churn", "HWA-CR-001 field note.pdf"));
        churn.Add(3);
        MustSucceed(CliRunner.Run(template, ["sync", .. common, .. SyncSettings]));

        churn.Add(3);
        churn.Add(3);
        return (known, churn.LastUnique!.Value);
    }

    private Row Run(FaultScenario scenario, string template, string directory, (string Phrase, string Path, int Page) known, (string Phrase, string Path, int Page) pending)
    {
        CopyDirectory(template, directory);
        var index = Path.Combine(directory, "index");
        string[] common = ["--index", index, "--root", Path.Combine(directory, "store")];
        if (scenario.Prelude is { } prelude)
        {
            var stopped = Faulted(directory, prelude, common);
            Assert.True(stopped.ExitCode == FaultInjection.ExitCode, $"{scenario.Name}: the prelude did not stop at its point:\n{stopped.Stdout}\n{stopped.Stderr}");
        }

        var before = Catalogued(index);
        var faulted = Faulted(directory, scenario, common);
        var fired = faulted.Stderr.Contains(FaultInjection.FiredMarker, StringComparison.Ordinal);
        var message = CheckHonest(scenario, faulted, fired).Replace(directory, "…", StringComparison.Ordinal);

        // verify reads only: it may name files a crash left, which the next writing open tidies; nothing else.
        var verify = CliRunner.Run(directory, ["verify", .. common, "--json"]);
        var report = JsonDocument.Parse(verify.Stdout).RootElement;
        var notes = Strings(report, "notes");
        Assert.True(verify.ExitCode == 0 && Strings(report, "problems").Count == 0, $"{scenario.Name}: verify after the fault:\n{verify.Stdout}\n{verify.Stderr}");
        Assert.True(notes.All(p => p.Contains(TempLeftover, StringComparison.Ordinal) || p.Contains(SegmentLeftover, StringComparison.Ordinal) || p.Contains(RetiredLeftover, StringComparison.Ordinal)), $"{scenario.Name}: verify after the fault:\n{verify.Stdout}");

        var after = Catalogued(index);
        AssertNoneLost(scenario, before, after);
        var leftovers = Leftovers(after.UncommittedTails, notes);
        AssertTopHit(scenario, directory, common, known);

        var next = CliRunner.Run(directory, ["sync", .. common, .. SyncSettings]);
        Assert.True(next.ExitCode == 0, $"{scenario.Name}: the next sync failed:\n{next.Stdout}\n{next.Stderr}");
        var clean = CliRunner.Run(directory, ["verify", .. common, "--json"]);
        var cleanReport = JsonDocument.Parse(clean.Stdout).RootElement;
        Assert.True(clean.ExitCode == 0 && Strings(cleanReport, "problems").Count == 0, $"{scenario.Name}: verify after the next sync:\n{clean.Stdout}");
        AssertNoneLost(scenario, before, Catalogued(index));

        // Pages a failed batch left wait out their back-off in the queue; none is without vectors and unqueued.
        var status = JsonDocument.Parse(CliRunner.Run(directory, ["status", .. common, "--json"]).Stdout).RootElement;
        var queued = status.GetProperty("queued").GetInt64();
        Assert.Equal(status.GetProperty("pages").GetInt64(), status.GetProperty("liveVectorSets").GetInt64() + queued);
        if (queued == 0)
        {
            AssertTopHit(scenario, directory, common, pending);
        }

        Directory.Delete(directory, recursive: true);
        return new Row(scenario, fired, faulted.ExitCode, message, before.Live.Count, after.Live.Count, leftovers, queued);
    }

    private static CliRunner.Result Faulted(string directory, FaultScenario scenario, string[] common)
    {
        string[] args = [scenario.Command, .. common, .. scenario.Command == "compact" ? CompactSettings : SyncSettings];
        return CliRunner.Run(directory, new Dictionary<string, string> { [FaultInjection.Variable] = scenario.Arming }, false, args);
    }

    /// <summary>Checks the faulted command's exit code and message; returns the message for the matrix.</summary>
    private static string CheckHonest(FaultScenario scenario, CliRunner.Result result, bool fired)
    {
        var all = result.Stderr + "\n" + result.Stdout;
        Assert.False(StackFrame().IsMatch(all) || all.Contains("Unhandled exception", StringComparison.Ordinal), $"{scenario.Name}: a stack trace:\n{all}");
        if (!fired)
        {
            Assert.True(result.ExitCode == 0, $"{scenario.Name}: not reached, yet exit {result.ExitCode}:\n{all}");
            return "not reached";
        }

        if (scenario.Action == "exit")
        {
            Assert.Equal(FaultInjection.ExitCode, result.ExitCode);
            return "stopped";
        }

        Assert.True(result.ExitCode == 1, $"{scenario.Name}: exit {result.ExitCode} after an I/O error:\n{all}");
        var line = all.Split('\n').Select(l => l.Trim()).FirstOrDefault(l => l.Contains("fault injected at", StringComparison.Ordinal) && !l.StartsWith(FaultInjection.FiredMarker, StringComparison.Ordinal));
        Assert.True(line is not null, $"{scenario.Name}: the I/O error is not reported:\n{all}");
        return line.Replace("|", "\\|", StringComparison.Ordinal);
    }

    private static void AssertTopHit(FaultScenario scenario, string directory, string[] common, (string Phrase, string Path, int Page) expected)
    {
        var search = CliRunner.Run(directory, ["search", .. common, expected.Phrase, "-k", "3", "--json"]);
        Assert.True(search.ExitCode == 0, $"{scenario.Name}: search failed:\n{search.Stdout}\n{search.Stderr}");
        var top = JsonDocument.Parse(search.Stdout).RootElement.GetProperty("hits")[0];
        Assert.Equal((expected.Path, expected.Page), (top.GetProperty("path").GetString(), top.GetProperty("page").GetInt32()));
    }

    private static string Render(IReadOnlyList<Row> rows)
    {
        var text = new StringBuilder();
        text.Append("""
            # Fault matrix

            Generated by `tests/IndexKeeper.Tests/Crash/FaultMatrixTests.cs`; do not edit by hand. To write it
            again after a change of the write path:
            `IK_WRITE_FAULT_MATRIX=1 dotnet test IndexKeeper.sln -c Release --no-build --filter FullyQualifiedName~FaultMatrixTests`
            (the test fails while this file differs from what the run produced).

            Each row runs the real `indexkeeper` on a copy of one small store of three-page PDF field notes (the
            hashed-term encoder, segments sealed at 1 MiB, batches of four pages): eight synced, two of them
            deleted and one added and synced again (so compaction has dead vector sets to drop), and two new
            ones not yet synced (so `sync` has pages to embed). The fault is armed with the
            environment variable `IK_FAULT_INJECTION=point:action[:nth]`, a test facility that is ignored unless
            set and that no configuration file or `INDEXKEEPER_` variable can set (`src/IndexKeeper.Core/Faults`).
            It fires at the nth reach of the point:

            - `exit`: the process ends at once with exit code 86, as a kill would (no finally blocks, no flush of
              buffered writes; what the page cache holds stays, as after SIGKILL).
            - `enospc`: the I/O throws the error a full disk throws ("No space left on device").
            - `eio`: the I/O throws the error a failing disk throws ("Input/output error").
            - `pause` (not a row of this matrix): the process waits at the point until the file named by
              `IK_FAULT_RESUME` exists (tests of readers beside a writer) or a stop signal has cancelled its work
              (`tests/IndexKeeper.Tests/CommandLine/StopSignalTests.cs`, and the daemon's in
              `tests/IndexKeeper.Tests/Daemon/DaemonShutdownTests.cs`), then goes on.

            Points (`FaultPoints`, in the order of the write path): a segment append before and after its fsync;
            a seal before its record, after its fsync, after the directory fsync (not yet recorded by the catalog);
            a compaction output's temp-file write, its rename (before, after); every directory fsync (before,
            after); every catalog transaction's commit (before, after; the one transaction helper); a compaction
            swap before and after its catalog commit; an old segment's delete (before, after); a page-word
            file's rewrite before its fsync, before and after the catalog commit that moves the pages' words, and
            before the old file's delete (the two deleted documents leave a quarter of the first file's words dead); recovery's cut of
            an uncommitted tail (before, after), its deletion of an unfinished compaction output and its setting
            aside of a segment no commit references.

            After each faulted command the test requires: exit 86 for `exit`, else exit 1 with a message that
            names the I/O error and no stack trace; `verify` (which reads only) exits 0 with no problems and
            notes nothing but files a crash may leave, which the next writing open tidies (docs/recovery.md: a temp file is removed, an
            unreferenced segment set aside, a segment a committed swap retired deleted, an uncommitted tail cut); every vector set live before the command
            still live, after the fault and after the next `sync`, unless its page is gone; a search that finds a
            page synced before; the next `sync` exit 0 and `verify` then clean; every page either live or
            queued. Columns: the command's exit code and message (paths shortened to …); live vector sets
            before and after the fault; what the fault left for the next writing open; pages still queued after
            the next `sync` (a batch that failed on an I/O error waits out its back-off).

            | command | point | fault | nth | exit | message | live before → after | left for the next open | queued after next sync |
            |---|---|---|---|---|---|---|---|---|

            """);
        foreach (var row in rows)
        {
            var command = row.Scenario.Prelude is { } prelude ? $"{row.Scenario.Command} after {prelude.Command} stopped at `{prelude.Point}`" : row.Scenario.Command;
            text.Append(CultureInfo.InvariantCulture, $"| {command} | `{row.Scenario.Point}` | {row.Scenario.Action} | {row.Scenario.Nth} | {(row.Fired ? row.ExitCode.ToString(CultureInfo.InvariantCulture) : "0")} | {row.Message} | {row.LiveBefore} → {row.LiveAfter} | {row.Leftovers} | {row.QueuedAfterNextSync} |\n");
        }

        return text.ToString();
    }

    /// <summary>Committed before the command and still held by a document: it must still be live.</summary>
    private static void AssertNoneLost(FaultScenario scenario, Catalog before, Catalog after)
    {
        var lost = before.Live.Where(after.Referenced.Contains).Where(k => !after.Live.Contains(k)).ToList();
        Assert.True(lost.Count == 0, $"{scenario.Name}: {lost.Count} committed vector sets of pages still held were lost, e.g. {lost.FirstOrDefault()}");
    }

    /// <summary>What the crash left for the next writing open (docs/recovery.md): temp files, unreferenced segments, uncommitted tails.</summary>
    private static string Leftovers(int uncommittedTails, List<string> notes)
    {
        var temp = notes.Count(p => p.Contains(TempLeftover, StringComparison.Ordinal));
        var unreferenced = notes.Count(p => p.Contains(SegmentLeftover, StringComparison.Ordinal));
        var retired = notes.Count(p => p.Contains(RetiredLeftover, StringComparison.Ordinal));
        var parts = new List<string>();
        if (temp > 0)
        {
            parts.Add($"{temp} compaction temp file(s)");
        }

        if (unreferenced > 0)
        {
            parts.Add($"{unreferenced} unreferenced segment(s)");
        }

        if (retired > 0)
        {
            parts.Add($"{retired} retired segment(s) not yet deleted");
        }

        if (uncommittedTails > 0)
        {
            parts.Add($"{uncommittedTails} uncommitted tail(s)");
        }

        return parts.Count == 0 ? "nothing" : string.Join(", ", parts);
    }

    /// <summary>Page keys with a live vector set, page keys some live document holds, and open segments longer than committed, read from the catalog itself.</summary>
    private static Catalog Catalogued(string index)
    {
        using var gate = ReaderGate.EnterShared(index);
        using var catalog = IndexCatalog.OpenReadOnly(gate);
        var live = catalog.Encoders.All().SelectMany(e => catalog.VectorSets.Live(e.Id)).Select(v => v.PageKey).ToHashSet(StringComparer.Ordinal);
        var tails = catalog.Segments.All().Count(s => !s.Sealed && File.Exists(SegmentFileNames.PathOf(Path.Combine(index, "segments"), s.Id))
            && new FileInfo(SegmentFileNames.PathOf(Path.Combine(index, "segments"), s.Id)).Length > s.Length);
        return new Catalog(live, catalog.Pages.All().Where(p => p.References > 0).Select(p => p.Id).ToHashSet(StringComparer.Ordinal), tails);
    }

    private static void CopyDirectory(string from, string to)
    {
        foreach (var file in Directory.EnumerateFiles(from, "*", SearchOption.AllDirectories))
        {
            var target = Path.Combine(to, Path.GetRelativePath(from, file));
            Directory.CreateDirectory(Path.GetDirectoryName(target)!);
            File.Copy(file, target);
        }
    }

    private static void MustSucceed(CliRunner.Result result) => Assert.True(result.ExitCode == 0, result.Stdout + result.Stderr);

    private static List<string> Strings(JsonElement report, string name) =>
        [.. report.GetProperty(name).EnumerateArray().Select(e => e.GetString()!)];

    private sealed record Catalog(HashSet<string> Live, HashSet<string> Referenced, int UncommittedTails);

    [GeneratedRegex(@"^\s+at \S+\(", RegexOptions.Multiline)]
    private static partial Regex StackFrame();
}
