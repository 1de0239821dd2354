using IndexKeeper.Cli.CommandLine;
using IndexKeeper.Cli.Output;
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

    /// <summary>Loads the settings and opens the index for <paramref name="command"/>, its use cases wired.</summary>
    public IndexComposition Open(string command, bool rootsRequired = true) => Open(LoadOptions(rootsRequired), command);

    public static IndexComposition Open(IndexKeeperOptions options, string command) => IndexComposition.Open(options, "indexkeeper " + command);

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
