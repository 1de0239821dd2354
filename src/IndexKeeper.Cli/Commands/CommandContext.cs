using IndexKeeper.Cli.CommandLine;
using IndexKeeper.Cli.Output;
using IndexKeeper.Core.Catalog;
using IndexKeeper.Service.Application;
using IndexKeeper.Service.Configuration;

namespace IndexKeeper.Cli.Commands;

/// <summary>What every command gets: its parsed arguments, the validated settings, the composed index, and one way to print its report.</summary>
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

    /// <summary>Loads the settings and opens (or creates) the index for <paramref name="command"/>, its use cases wired.</summary>
    public IndexComposition Open(string command) => Open(LoadOptions(), command);

    /// <summary>As <see cref="Open(string)"/>, for an index that must already exist (<see cref="LoadForExistingIndex"/>).</summary>
    public IndexComposition OpenExisting(string command, bool rootsRequired = false) => Open(LoadForExistingIndex(rootsRequired), command);

    public static IndexComposition Open(IndexKeeperOptions options, string command) => IndexComposition.Open(options, "indexkeeper " + command);

    /// <summary>For a command that only reads: no byte of the index is changed (<see cref="IndexComposition.OpenReadOnly"/>).</summary>
    public static IndexComposition OpenForReading(IndexKeeperOptions options) => IndexComposition.OpenReadOnly(options);

    /// <summary>The report as one JSON object with <c>--json</c>, else as <paramref name="text"/> writes it; returns <paramref name="exitCode"/>.</summary>
    public int Print<T>(T report, Action<TextWriter, T> text, int exitCode = 0)
    {
        ArgumentNullException.ThrowIfNull(text);
        if (Json)
        {
            JsonOutput.Write(report);
        }
        else
        {
            text(Console.Out, report);
        }

        return exitCode;
    }
}
