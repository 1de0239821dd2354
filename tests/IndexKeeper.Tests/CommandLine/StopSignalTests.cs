using System.Diagnostics;
using System.Runtime.InteropServices;
using System.Text.Json;
using IndexKeeper.Core.Faults;
using IndexKeeper.Tests.Crash;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.CommandLine;

/// <summary>
/// Ctrl+C (SIGINT) and SIGTERM stop a sync with exit 130 and keep what it committed (docs/cli.md, "Exit
/// codes"). No timing: the process is held at a named point of the write path (the fault facility's
/// <c>pause</c>) after one batch is committed, the signal is sent while it waits there, and the command
/// lets the point go only once the signal has cancelled its work.
/// </summary>
public sealed class StopSignalTests
{
    // signal(7) of Linux: SIGINT 2, SIGTERM 15 (from memory; POSIX fixes only SIGINT's and SIGTERM's names).
    private const int SigInt = 2;
    private const int SigTerm = 15;

    [Theory]
    [InlineData(SigInt)]
    [InlineData(SigTerm)]
    public async Task A_stop_signal_during_sync_exits_130_and_keeps_committed_batches(int signal)
    {
        if (!OperatingSystem.IsLinux())
        {
            return;
        }

        using var temp = new TempDirectory();
        var store = temp.Combine("store");
        var churn = new StoreChurn(store, 4242);
        for (var i = 0; i < 4; i++)
        {
            churn.Add(3);
        }

        string[] common = ["--index", temp.Combine("index"), "--root", store];

        // Batches of two pages; the pause holds the second batch's append, after the first batch's commit.
        var start = WithDefaultSigInt(CliRunner.StartInfo(temp.Path, ["sync", .. common, "--Encoder:BatchSize=2", "--Detect:SettleSeconds=0", "--json"]));
        start.Environment["IK_FAULT_INJECTION"] = $"{FaultPoints.SegmentAppendBeforeFsync}:pause:2";
        using var process = Process.Start(start)!;
        var stdout = process.StandardOutput.ReadToEndAsync();
        var stderr = new List<string>();
        while (process.StandardError.ReadLine() is { } line)
        {
            stderr.Add(line);
            if (line.StartsWith(FaultInjection.FiredMarker, StringComparison.Ordinal))
            {
                Assert.Equal(0, Kill(process.Id, signal));
                break;
            }
        }

        stderr.AddRange((await process.StandardError.ReadToEndAsync()).Split('\n'));
        Assert.True(process.WaitForExit(TimeSpan.FromMinutes(2)), "sync did not stop after the signal");
        var all = string.Join('\n', stderr);
        Assert.True(process.ExitCode == 130, $"exit {process.ExitCode}:\n{all}");
        Assert.Contains("stopped; work committed so far is kept", all, StringComparison.Ordinal);
        Assert.Equal(string.Empty, await stdout);

        // The first batch is committed and live; the rest waits in the queue; nothing is damaged.
        var status = JsonDocument.Parse(CliRunner.Run(temp.Path, ["status", .. common, "--json"]).Stdout).RootElement;
        var live = status.GetProperty("liveVectorSets").GetInt32();
        Assert.InRange(live, 2, 11);
        Assert.Equal(12 - live, status.GetProperty("queued").GetInt32());
        Assert.Equal(0, CliRunner.Run(temp.Path, ["verify", .. common]).ExitCode);

        // The next sync embeds only what was left.
        var next = CliRunner.Run(temp.Path, ["sync", .. common, "--Detect:SettleSeconds=0", "--json"]);
        Assert.Equal(0, next.ExitCode);
        Assert.Equal(12 - live, JsonDocument.Parse(next.Stdout).RootElement.GetProperty("pagesEmbedded").GetInt32());
    }

    /// <summary>
    /// Starts the command through coreutils' <c>env --default-signal=INT</c>. A test host started in the
    /// background by a non-interactive shell inherits SIGINT ignored (POSIX, Shell Command Language §2.11, from memory:
    /// asynchronous lists ignore SIGINT), the command would inherit that too, and an ignored SIGINT is not
    /// what an operator's Ctrl+C meets.
    /// </summary>
    private static ProcessStartInfo WithDefaultSigInt(ProcessStartInfo start)
    {
        var arguments = start.ArgumentList.ToList();
        start.ArgumentList.Clear();
        start.ArgumentList.Add("--default-signal=INT");
        start.ArgumentList.Add(start.FileName);
        foreach (var argument in arguments)
        {
            start.ArgumentList.Add(argument);
        }

        start.FileName = "env";
        return start;
    }

    [DllImport("libc", EntryPoint = "kill")]
    private static extern int Kill(int pid, int signal);
}
