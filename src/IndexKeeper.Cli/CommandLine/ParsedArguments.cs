namespace IndexKeeper.Cli.CommandLine;

/// <summary>The command line after parsing: the command, the common options, and what is left for the command.</summary>
internal sealed class ParsedArguments
{
    public string Command { get; init; } = string.Empty;

    public string? IndexDirectory { get; init; }

    public List<string> Roots { get; } = [];

    public string? ConfigFile { get; init; }

    public bool Json { get; init; }

    public List<string> Overrides { get; } = [];

    public List<string> Positional { get; } = [];

    /// <summary>Command-specific options by name (without dashes), e.g. <c>output</c> for <c>--output DIR</c>.</summary>
    public Dictionary<string, string> Named { get; } = new(StringComparer.Ordinal);

    /// <summary>Command-specific flags given (without dashes), e.g. <c>check-canaries</c>.</summary>
    public HashSet<string> Flags { get; } = new(StringComparer.Ordinal);
}
