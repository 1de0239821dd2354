using IndexKeeper.Tests.Crash;
using IndexKeeper.Tests.EndToEnd;
using IndexKeeper.Tests.Support;
using Xunit.Abstractions;

namespace IndexKeeper.Tests.Daemon;

/// <summary>
/// The daemon's index on a disk that fills up (a tmpfs, so ENOSPC comes from the kernel, not from a
/// timer). The work loop heals or stops: it backs off and retries with /health degraded and the reason
/// logged; when the fault leaves the catalog unusable (LiteDB refuses every use after a failed write) it
/// exits 1, and the restart a service manager makes (Restart=on-failure in config/indexkeeper.service;
/// the test plays that part) carries on once there is room. It never lives on with a dead loop.
/// </summary>
public sealed class DaemonFullDiskTests(ITestOutputHelper output)
{
    private const int Added = 5;
    private const int PagesEach = 3;

    [TmpfsFact]
    public void AFullIndexDiskIsRetriedThenHealsOrExitsForARestart()
    {
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("store"));
        File.WriteAllBytes(temp.Combine("store", "pump-log.pdf"), StorePdfs.Document("Millrace", 2));
        using var disk = TmpfsMount.Mount(temp.Combine("index"), 16 * 1024);
        var filler = temp.Combine("index", "filler.bin");
        string[] args = ["--root", "store", "--encoder", "hashed-terms", "--Schedule:Windows:0=Mon-Sun 00:00-24:00", "--Detect:SettleSeconds=0.2", "--Daemon:SampleSeconds=0.2"];
        try
        {
            bool exited;
            using (var daemon = RunningDaemon.Start(temp.Path, args))
            {
                daemon.WaitUntil("the first document is embedded", () => daemon.GetJson("/api/status").GetProperty("liveVectorSets").GetInt64() == 2);

                // Fill the disk to the last byte, then give the daemon something to write.
                Fill(filler);
                for (var i = 0; i < Added; i++)
                {
                    File.WriteAllBytes(temp.Combine("store", $"sluice-{i}.pdf"), StorePdfs.Document($"Sluice{i}", PagesEach));
                }

                daemon.WaitUntilOrExit("health reports the work loop retrying", () => daemon.Health().Contains("work-loop-retrying", StringComparison.Ordinal));
                // The log line reaches our end of the stderr pipe after the health state is published: wait for it.
                daemon.WaitUntilOrExit("the fault is logged", () => daemon.Stderr.Contains("The work loop hit a fault", StringComparison.Ordinal) && daemon.Stderr.Contains("No space left on device", StringComparison.Ordinal));
                Assert.True(daemon.Stderr.Contains("The work loop hit a fault", StringComparison.Ordinal), daemon.Stderr);
                Assert.True(daemon.Stderr.Contains("No space left on device", StringComparison.Ordinal), daemon.Stderr);
                File.Delete(filler);

                // Room again: either the loop carries on by itself, or it has found the catalog unusable and exited.
                exited = daemon.WaitUntilOrExit("every page added while the disk was full is embedded", () => LiveVectorSets(daemon) == 2 + (Added * PagesEach));
                Assert.DoesNotContain("Unhandled exception", daemon.Stderr, StringComparison.Ordinal);
                Assert.DoesNotContain("BackgroundService", daemon.Stderr, StringComparison.Ordinal);
                if (exited)
                {
                    output.WriteLine("the daemon exited for a restart:\n" + daemon.Stderr);
                    Assert.Equal(1, daemon.ExitCode);
                    Assert.True(
                        daemon.Stderr.Contains("The work loop stopped", StringComparison.Ordinal) || daemon.Stderr.Contains("exiting for a restart", StringComparison.Ordinal),
                        "the exit should say why:\n" + daemon.Stderr);
                }
                else
                {
                    output.WriteLine("the daemon carried on in place");
                    daemon.WaitUntil("health reports no fault of the work loop", () => !daemon.Health().Contains("work-loop", StringComparison.Ordinal));
                    Assert.Equal(0, daemon.Terminate(RunningDaemon.Patience));
                }
            }

            if (exited)
            {
                // What systemd's Restart=on-failure does: start it again, on the same index, now with room.
                using var restarted = RunningDaemon.Start(temp.Path, args);
                WaitUntilAllEmbedded(restarted);
                Assert.Equal(0, restarted.Terminate(RunningDaemon.Patience));
            }

            var verify = CliRunner.Run(temp.Path, "verify", "--index", "index", "--root", "store");
            Assert.True(verify.ExitCode == 0, verify.Stdout + verify.Stderr);
        }
        finally
        {
            File.Delete(filler);
        }
    }

    private static void WaitUntilAllEmbedded(RunningDaemon daemon)
    {
        daemon.WaitUntil("every page added while the disk was full is embedded", () => LiveVectorSets(daemon) == 2 + (Added * PagesEach));
        daemon.WaitUntil("health reports no fault of the work loop", () => !daemon.Health().Contains("work-loop", StringComparison.Ordinal));
    }

    /// <summary>Live vector sets, or -1 while the API cannot answer (a catalog that refuses use answers 500).</summary>
    private static long LiveVectorSets(RunningDaemon daemon)
    {
        using var response = daemon.Client.GetAsync("/api/status").GetAwaiter().GetResult();
        if (!response.IsSuccessStatusCode)
        {
            return -1;
        }

        using var json = System.Text.Json.JsonDocument.Parse(response.Content.ReadAsStringAsync().GetAwaiter().GetResult());
        return json.RootElement.GetProperty("liveVectorSets").GetInt64();
    }

    private static void Fill(string path)
    {
        var block = new byte[64 * 1024];
        using var stream = new FileStream(path, FileMode.Create, FileAccess.Write, FileShare.None, 1, FileOptions.None);
        try
        {
            while (true)
            {
                stream.Write(block);
            }
        }
        catch (IOException)
        {
            // ENOSPC: the disk is full. Whatever fitted stays; write the last few bytes one at a time.
        }

        try
        {
            while (true)
            {
                stream.WriteByte(0);
            }
        }
        catch (IOException)
        {
        }
    }
}
