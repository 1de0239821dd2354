using System.CommandLine;
using IndexKeeper.Cli.CommandLine;
using IndexKeeper.Cli.Output;
using IndexKeeper.Core.Catalog;
using IndexKeeper.Service.Application;
using IndexKeeper.Service.Configuration;

namespace IndexKeeper.Cli.Commands;

/// <summary>What every command gets: what the parser found, the validated settings, the composed index, and one way to print its report.</summary>
/// <param name="parsed">The parse of the command line.</param>
/// <param name="settings">Settings given as <c>--Section:Key=value</c>, in order.</param>
internal sealed class CommandContext(ParseResult parsed, IReadOnlyList<string> settings)
{
    public bool Json => parsed.GetValue(CommonOptions.Json);

    public string? ConfigFile => parsed.GetValue(CommonOptions.Config);

    /// <summary>Command-line settings, highest precedence: <c>--encoder</c> first, then each <c>--Section:Key=value</c> in order.</summary>
    public List<string> Overrides { get; } =
        [.. parsed.GetValue(CommonOptions.Encoder) is { } encoder ? ["Encoder:Name=" + encoder] : Array.Empty<string>(), .. settings];

    public T? Value<T>(Option<T> option) => parsed.GetValue(option);

    public T? Value<T>(Argument<T> argument) => parsed.GetValue(argument);

    /// <param name="rootsRequired">False for commands that only read the index and its stored words.</param>
    public IndexKeeperOptions LoadOptions(bool rootsRequired = true) =>
        OptionsLoader.Load(new ConfigurationSources(ConfigFile, parsed.GetValue(CommonOptions.Index), parsed.GetValue(CommonOptions.Roots) ?? [], Overrides), rootsRequired);

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
