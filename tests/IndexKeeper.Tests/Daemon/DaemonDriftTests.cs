using IndexKeeper.Tests.EndToEnd;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Daemon;

/// <summary>
/// A changed encoder under the daemon: the old vectors keep serving while the pages migrate inside a window,
/// then the index switches over by itself and search ranks with the new encoder.
/// </summary>
public sealed class DaemonDriftTests
{
    [Fact]
    public void AChangedEncoderMigratesInsideAWindowAndSwitchesOver()
    {
        const int documents = 6;
        const int pagesEach = 4;
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("store"));
        for (var i = 0; i < documents; i++)
        {
            File.WriteAllBytes(temp.Combine("store", $"valve-log-{i:D2}.pdf"), StorePdfs.Document($"sluicegate{i:D2}", pagesEach));
        }

        string[] common = ["--root", "store", "--encoder", "hashed-terms", "--Detect:SettleSeconds=0.2", "--Daemon:SampleSeconds=0.2", "--Schedule:Windows:0=Mon-Sun 00:00-24:00"];
        string firstId;
        using (var daemon = RunningDaemon.Start(temp.Path, common))
        {
            daemon.WaitUntil("every page has vectors", () => daemon.GetJson("/api/status") is var s
                && s.GetProperty("queued").GetInt64() == 0 && s.GetProperty("liveVectorSets").GetInt64() == documents * pagesEach);
            firstId = daemon.GetJson("/api/status").GetProperty("servingEncoderId").GetString()!;
            Assert.Equal(0, daemon.Terminate(RunningDaemon.Patience));
        }

        // A new d is a new encoder id (docs/encoders.md): every page is drifted and migrates, at window speed.
        using (var daemon = RunningDaemon.Start(temp.Path, [.. common, "--Encoder:Dimensions=64"]))
        {
            daemon.WaitUntil("the index switched over to the new encoder", () => daemon.GetJson("/api/status") is var s
                && s.GetProperty("servingEncoderId").GetString() == s.GetProperty("activeEncoderId").GetString()
                && s.GetProperty("pagesDrifted").GetInt64() == 0 && s.GetProperty("queued").GetInt64() == 0
                && s.GetProperty("liveVectorSets").GetInt64() == documents * pagesEach);
            var status = daemon.GetJson("/api/status");
            Assert.NotEqual(firstId, status.GetProperty("servingEncoderId").GetString());
            Assert.Equal(2 * documents * pagesEach, status.GetProperty("vectorSets").GetInt64());
            Assert.Contains("store/valve-log-03.pdf", daemon.SearchPaths("sluicegate03 register"));
            Assert.Contains("Migration complete", daemon.Stderr, StringComparison.Ordinal);
            Assert.Equal(0, daemon.Terminate(RunningDaemon.Patience));
        }

        var verify = CliRunner.Run(temp.Path, "verify", "--index", "index", "--root", "store", "--encoder", "hashed-terms", "--Encoder:Dimensions=64", "--json");
        Assert.True(verify.ExitCode == 0, verify.Stdout + verify.Stderr);
    }
}
