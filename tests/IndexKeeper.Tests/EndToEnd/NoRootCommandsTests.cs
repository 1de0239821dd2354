using System.Text.Json;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.EndToEnd;

/// <summary>Commands that only read the index need no root; commands that walk the store still name the missing setting.</summary>
public sealed class NoRootCommandsTests
{
    [Fact]
    public void Status_search_and_encoders_answer_with_only_the_index()
    {
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("store"));
        File.WriteAllBytes(temp.Combine("store", "filter-bed-log.pdf"), StorePdfs.Document("backwash", 2));
        var sync = CliRunner.Run(temp.Path, "sync", "--index", "index", "--root", "store", "--json");
        Assert.True(sync.ExitCode == 0, sync.Stdout + sync.Stderr);

        var status = CliRunner.Run(temp.Path, "status", "--index", "index", "--json");
        Assert.True(status.ExitCode == 0, status.Stdout + status.Stderr);
        using (var report = JsonDocument.Parse(status.Stdout))
        {
            Assert.Equal(1, report.RootElement.GetProperty("documents").GetInt64());
            Assert.Equal(["store"], report.RootElement.GetProperty("roots").EnumerateArray().Select(r => r.GetString()));
        }

        var search = CliRunner.Run(temp.Path, "search", "--index", "index", "backwash register", "--json");
        Assert.True(search.ExitCode == 0, search.Stdout + search.Stderr);
        using (var report = JsonDocument.Parse(search.Stdout))
        {
            Assert.Equal("filter-bed-log.pdf", report.RootElement.GetProperty("hits")[0].GetProperty("path").GetString());
        }

        var encoders = CliRunner.Run(temp.Path, "encoders", "--index", "index", "--json");
        Assert.True(encoders.ExitCode == 0, encoders.Stdout + encoders.Stderr);

        foreach (var walking in new[] { "scan", "sync", "plan" })
        {
            var refused = CliRunner.Run(temp.Path, walking, "--index", "index");
            Assert.Equal(2, refused.ExitCode);
            Assert.Contains("Roots:", refused.Stderr, StringComparison.Ordinal);
        }
    }
}
