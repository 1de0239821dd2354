using System.Text.Json;
using IndexKeeper.Core.Faults;
using IndexKeeper.Tests.EndToEnd;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Daemon;

/// <summary>SIGTERM (what systemd sends on stop) while the daemon embeds: a clean exit, an index that verifies, nothing lost after a restart.</summary>
public sealed class DaemonShutdownTests
{
    [Fact]
    public void SigtermMidBatchThenRestartLosesNothing()
    {
        const int documents = 30;
        const int pagesEach = 10;
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("store"));
        for (var i = 0; i < documents; i++)
        {
            File.WriteAllBytes(temp.Combine("store", $"manual-{i:D2}.pdf"), StorePdfs.Document($"pumphouse{i:D2}", pagesEach));
        }

        // Batches of two pages; the first daemon pauses at its third batch's append (a named fault point, no timing):
        // two batches are committed and the rest queued when the stop lands, which resumes the pause.
        string[] args = ["--root", "store", "--encoder", "hashed-terms", "--Encoder:BatchSize=2", "--Detect:SettleSeconds=0.2", "--Daemon:SampleSeconds=0.2", "--Schedule:Windows:0=Mon-Sun 00:00-24:00"];
        var paused = new Dictionary<string, string> { [FaultInjection.Variable] = $"{FaultPoints.SegmentAppendBeforeFsync}:pause:3" };
        using (var daemon = RunningDaemon.Start(temp.Path, args, environment: paused))
        {
            daemon.WaitUntil("some pages have vectors and some are still queued", () =>
            {
                var status = daemon.GetJson("/api/status");
                return status.GetProperty("liveVectorSets").GetInt64() > 0 && status.GetProperty("queued").GetInt64() > 0;
            });
            var exit = daemon.Terminate(RunningDaemon.Patience);
            Assert.True(exit == 0, $"exit {exit}\n{daemon.Stderr}");
            Assert.Contains("Work loop stopped cleanly", daemon.Stderr, StringComparison.Ordinal);
        }

        Assert.False(File.Exists(Path.Combine(temp.Path, "index", "daemon.json")), "the endpoint file should be removed at exit");
        var verify = CliRunner.Run(temp.Path, "verify", "--index", "index", "--root", "store", "--encoder", "hashed-terms", "--json");
        Assert.True(verify.ExitCode == 0, verify.Stdout + verify.Stderr);

        using (var daemon = RunningDaemon.Start(temp.Path, args))
        {
            daemon.WaitUntil("every page has vectors after the restart", () =>
            {
                var status = daemon.GetJson("/api/status");
                return status.GetProperty("queued").GetInt64() == 0 && status.GetProperty("liveVectorSets").GetInt64() == documents * pagesEach;
            });
            Assert.Equal(documents, daemon.GetJson("/api/status").GetProperty("documents").GetInt64());
            Assert.Contains("store/manual-07.pdf", daemon.SearchPaths("pumphouse07 register"));
            Assert.Equal(0, daemon.Terminate(RunningDaemon.Patience));
        }

        var after = CliRunner.Run(temp.Path, "verify", "--index", "index", "--root", "store", "--encoder", "hashed-terms", "--json");
        Assert.True(after.ExitCode == 0, after.Stdout + after.Stderr);
        using var report = JsonDocument.Parse(after.Stdout);
        Assert.Equal(JsonValueKind.Object, report.RootElement.ValueKind);
    }
}
