using System.Text.Json;
using IndexKeeper.Tests.EndToEnd;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Daemon;

/// <summary>While the daemon holds the index, read-only commands ask it over the API and commands that write say who holds the index.</summary>
public sealed class CliThroughDaemonTests
{
    [Fact]
    public void StatusAndSearchAskTheDaemonAndWritersAreTurnedAway()
    {
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("store"));
        File.WriteAllBytes(temp.Combine("store", "ferry-timetable.pdf"), StorePdfs.Document("Gullstone", 2));
        string[] common = ["--index", "index", "--root", "store", "--encoder", "hashed-terms"];
        using var daemon = RunningDaemon.Start(temp.Path, ["--root", "store", "--encoder", "hashed-terms", "--Schedule:Windows:0=Mon-Sun 00:00-24:00"]);
        daemon.WaitUntil("the document is embedded", () => daemon.GetJson("/api/status").GetProperty("liveVectorSets").GetInt64() == 2);

        var status = CliRunner.Run(temp.Path, ["status", .. common, "--json"]);
        Assert.True(status.ExitCode == 0, status.Stderr);
        Assert.Contains("asking it at", status.Stderr, StringComparison.Ordinal);
        using (var json = JsonDocument.Parse(status.Stdout))
        {
            Assert.Equal(1, json.RootElement.GetProperty("documents").GetInt64());
            Assert.Equal(2, json.RootElement.GetProperty("liveVectorSets").GetInt64());
        }

        var search = CliRunner.Run(temp.Path, ["search", "Gullstone register", .. common, "-k", "3", "--json"]);
        Assert.True(search.ExitCode == 0, search.Stderr);
        using (var json = JsonDocument.Parse(search.Stdout))
        {
            Assert.Equal("ferry-timetable.pdf", json.RootElement.GetProperty("hits")[0].GetProperty("path").GetString());
        }

        // The plan is built on the daemon's work loop and comes back as the same JSON contract.
        var plan = CliRunner.Run(temp.Path, ["plan", .. common, "--json"]);
        Assert.True(plan.ExitCode == 0, plan.Stderr);
        using (var json = JsonDocument.Parse(plan.Stdout))
        {
            Assert.Equal(0, json.RootElement.GetProperty("pagesToEmbed").GetInt64());
            Assert.True(json.RootElement.TryGetProperty("estimatedFinish", out _));
        }

        Assert.Equal(0, daemon.GetJson("/api/plan").GetProperty("pagesToRemove").GetInt64());

        foreach (var writer in new[] { "sync", "scan", "compact" })
        {
            var refused = CliRunner.Run(temp.Path, [writer, .. common]);
            Assert.Equal(1, refused.ExitCode);
            Assert.Contains("It is the daemon", refused.Stderr, StringComparison.Ordinal);
        }

        Assert.Equal(0, daemon.Terminate(RunningDaemon.Patience));

        // With the daemon gone the commands open the index themselves again.
        var direct = CliRunner.Run(temp.Path, ["status", .. common, "--json"]);
        Assert.True(direct.ExitCode == 0, direct.Stderr);
        Assert.DoesNotContain("asking it at", direct.Stderr, StringComparison.Ordinal);
    }
}
