using IndexKeeper.Cli.CommandLine;

namespace IndexKeeper.Tests.Configuration;

/// <summary>Command flags (options without a value), as <c>encoders --check-canaries</c> uses them.</summary>
public sealed class CommandFlagTests
{
    private static readonly Dictionary<string, IReadOnlySet<string>> Options = new()
    {
        ["encoders"] = new HashSet<string>(),
        ["status"] = new HashSet<string>(),
    };

    private static readonly Dictionary<string, IReadOnlySet<string>> Flags = new()
    {
        ["encoders"] = new HashSet<string> { "check-canaries" },
    };

    [Fact]
    public void A_declared_flag_takes_no_value()
    {
        var parsed = ArgumentParser.Parse(["encoders", "--check-canaries", "--json", "--index", "ix"], Options, Flags);
        Assert.Contains("check-canaries", parsed.Flags);
        Assert.True(parsed.Json);
        Assert.Equal("ix", parsed.IndexDirectory);
        Assert.Empty(parsed.Positional);
    }

    [Fact]
    public void A_flag_of_another_command_is_refused()
    {
        var error = Assert.Throws<UsageException>(() => ArgumentParser.Parse(["status", "--check-canaries"], Options, Flags));
        Assert.Contains("--check-canaries", error.Message, StringComparison.Ordinal);
        Assert.Empty(ArgumentParser.Parse(["encoders"], Options, Flags).Flags);
    }
}
