using System.Text.Json;
using IndexKeeper.Core.Catalog;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Configuration;

/// <summary>The command-line contract of docs/cli.md, checked on the real executable.</summary>
public sealed class CommandLineContractTests
{
    [Theory]
    [InlineData("--Limits:MaxPages=0", "Limits:MaxPages")]
    [InlineData("--Limits:ReadTimeoutSeconds=-1", "Limits:ReadTimeoutSeconds")]
    [InlineData("--Limits:MaxPages=many", "Limits:MaxPages")]
    [InlineData("--Detect:SettleSecnds=1", "SettleSecnds")]
    public void Bad_setting_exits_2_and_names_it(string setting, string named)
    {
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("docs"));
        var result = CliRunner.Run(temp.Path, "scan", "--index", "idx", "--root", "docs", setting);
        Assert.Equal(2, result.ExitCode);
        Assert.Contains(named, result.Stderr, StringComparison.Ordinal);
        Assert.Equal(string.Empty, result.Stdout);
    }

    [Fact]
    public void Bad_configuration_file_value_exits_2_and_names_it()
    {
        using var temp = new TempDirectory();
        var config = temp.Write("ik.json", """
            { "IndexDirectory": "idx", "Roots": [ { "Name": "bad name!", "Path": "docs", "Exclude": [ "../outside" ] } ] }
            """);
        var result = CliRunner.Run(temp.Path, "status", "--config", config);
        Assert.Equal(2, result.ExitCode);
        Assert.Contains("Roots:0:Name", result.Stderr, StringComparison.Ordinal);
        Assert.Contains("Roots:0:Exclude:0", result.Stderr, StringComparison.Ordinal);
    }

    [Fact]
    public void Unknown_command_and_option_exit_2()
    {
        using var temp = new TempDirectory();
        Assert.Equal(2, CliRunner.Run(temp.Path, "frobnicate").ExitCode);
        Assert.Equal(2, CliRunner.Run(temp.Path, "scan", "--no-such-option", "x").ExitCode);
        Assert.Equal(2, CliRunner.Run(temp.Path).ExitCode);
    }

    [Fact]
    public void Scan_json_prints_one_object_with_the_contract_fields()
    {
        using var temp = new TempDirectory();
        temp.Write("docs/notes.txt", "not a document");
        var result = CliRunner.Run(temp.Path, "scan", "--index", "idx", "--root", "docs", "--json");
        Assert.Equal(0, result.ExitCode);
        using var json = JsonDocument.Parse(result.Stdout);
        foreach (var field in new[]
        {
            "documentsSeen", "documentsNew", "documentsChanged", "documentsUnchanged", "documentsDeleted", "documentsQuarantined",
            "pagesSeen", "pagesNew", "pagesReused", "pagesRemoved", "pagesEmbedded", "elapsedSeconds",
        })
        {
            Assert.True(json.RootElement.TryGetProperty(field, out _), field);
        }

        Assert.Equal(0, json.RootElement.GetProperty("pagesEmbedded").GetInt32());
    }

    [Fact]
    public void Second_process_on_a_locked_index_is_refused_and_names_the_holder()
    {
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("docs"));
        using var held = IndexLock.Acquire(temp.Combine("idx"), "test holder");
        var result = CliRunner.Run(temp.Path, "scan", "--index", "idx", "--root", "docs");
        Assert.Equal(1, result.ExitCode);
        Assert.Contains($"process {Environment.ProcessId}", result.Stderr, StringComparison.Ordinal);
        Assert.False(File.Exists(temp.Combine("idx", CatalogSchema.FileName)));
    }
}
