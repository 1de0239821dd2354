using IndexKeeper.Service.Configuration;
using IndexKeeper.Service.Hosting;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.CommandLine;

/// <summary>Help for every command and option, the version with the built-in encoder ids, and typo suggestions (docs/cli.md).</summary>
public sealed class HelpAndVersionTests
{
    public static TheoryData<string, string[]> Commands => new()
    {
        { "sync", [] },
        { "scan", [] },
        { "status", [] },
        { "search", ["-k", "--maps", "<text>"] },
        { "compact", [] },
        { "verify", [] },
        { "repair", [] },
        { "rebuild-catalog", [] },
        { "forget-root", ["--yes", "<name>"] },
        { "demo", ["--output"] },
        { "plan", ["--calibrate"] },
        { "encoders", ["--check-canaries"] },
        { "run", ["--listen"] },
    };

    [Theory]
    [MemberData(nameof(Commands))]
    public void Every_command_describes_itself_and_each_of_its_options(string command, string[] own)
    {
        using var temp = new TempDirectory();
        foreach (var flag in new[] { "--help", "-h" })
        {
            var result = CliRunner.Run(temp.Path, command, flag);
            Assert.Equal(0, result.ExitCode);
            Assert.Contains($"indexkeeper {command}", result.Stdout, StringComparison.Ordinal);
            foreach (var option in own.Concat(["--index", "--root", "--config", "--encoder", "--json"]))
            {
                Assert.Contains(option, result.Stdout, StringComparison.Ordinal);
            }
        }

        // The old spelling of help still works, and help never touches an index.
        Assert.Equal(0, CliRunner.Run(temp.Path, "help", command).ExitCode);
        Assert.Empty(Directory.EnumerateFileSystemEntries(temp.Path));
    }

    [Fact]
    public void Version_names_the_build_and_the_built_in_encoder_ids()
    {
        using var temp = new TempDirectory();
        var result = CliRunner.Run(temp.Path, "--version");

        Assert.Equal(0, result.ExitCode);
        Assert.StartsWith("indexkeeper ", result.Stdout, StringComparison.Ordinal);
        foreach (var name in new[] { "hashed-terms", "minilm" })
        {
            var encoder = EncoderFactory.Create(new EncoderOptions { Name = name });
            Assert.Contains(encoder.Identity.Id, result.Stdout, StringComparison.Ordinal);
            (encoder as IDisposable)?.Dispose();
        }

        Assert.Contains("page-image", result.Stdout, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("synk", "sync")]
    [InlineData("encodres", "encoders")]
    public void A_mistyped_command_exits_2_and_names_the_nearest(string typed, string meant)
    {
        using var temp = new TempDirectory();
        var result = CliRunner.Run(temp.Path, typed, "--index", "idx");

        Assert.Equal(2, result.ExitCode);
        Assert.Equal(string.Empty, result.Stdout);
        Assert.Contains(meant, result.Stderr.Split('\n').Select(l => l.Trim()));
    }

    [Fact]
    public void Settings_and_repeated_options_parse_as_before()
    {
        using var temp = new TempDirectory();
        Directory.CreateDirectory(temp.Combine("a"));
        Directory.CreateDirectory(temp.Combine("b"));

        // Two roots, a setting between options, and a repeated --index whose last value wins.
        var result = CliRunner.Run(temp.Path, "scan", "--index", "first", "--root", "a", "--Detect:SettleSeconds=0", "--root", "b", "--index", "idx", "--json");

        Assert.Equal(0, result.ExitCode);
        Assert.True(Directory.Exists(temp.Combine("idx")));
        Assert.False(Directory.Exists(temp.Combine("first")));
    }
}
