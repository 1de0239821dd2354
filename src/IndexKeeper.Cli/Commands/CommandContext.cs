using IndexKeeper.Cli.CommandLine;
using IndexKeeper.Core.Catalog;
using IndexKeeper.Service.Configuration;

namespace IndexKeeper.Cli.Commands;

/// <summary>What every command gets: its parsed arguments and a way to load the validated settings.</summary>
internal sealed class CommandContext(ParsedArguments arguments)
{
    public ParsedArguments Arguments { get; } = arguments;

    public bool Json => Arguments.Json;

    /// <param name="rootsRequired">False for commands that only read the index and its stored words.</param>
    public IndexKeeperOptions LoadOptions(bool rootsRequired = true) =>
        OptionsLoader.Load(new ConfigurationSources(Arguments.ConfigFile, Arguments.IndexDirectory, Arguments.Roots, Arguments.Overrides), rootsRequired);

    /// <summary>
    /// Settings for a command that reads or tends an index that must already exist: a mistyped --index or a
    /// lost catalog is an error (exit 2) and nothing is created (<see cref="ExistingIndex"/>).
    /// </summary>
    public IndexKeeperOptions LoadForExistingIndex(bool rootsRequired = false)
    {
        var options = LoadOptions(rootsRequired);
        ExistingIndex.Require(options.IndexDirectory);
        return options;
    }
}
