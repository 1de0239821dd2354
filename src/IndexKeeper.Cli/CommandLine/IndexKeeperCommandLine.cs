using System.CommandLine;
using System.CommandLine.Invocation;
using IndexKeeper.Cli.Commands;

namespace IndexKeeper.Cli.CommandLine;

/// <summary>
/// The command line on System.CommandLine (docs/cli.md, "Why System.CommandLine"): one subcommand per
/// <see cref="CommandBase"/>, the common options inherited by all, help on <c>-h</c>/<c>--help</c>,
/// <c>--version</c>, typo suggestions and the completion directive. A usage error exits 2, never 1.
/// </summary>
internal static class IndexKeeperCommandLine
{
    public const int UsageExitCode = 2;

    private const string Description =
        "IndexKeeper keeps a late-interaction page index true to a changing document store.\n" +
        "Settings: a JSON file (--config), then environment variables INDEXKEEPER_Section__Key, then --Section:Key=value " +
        "on the command line; every bad one is reported at once.\n" +
        "Exit codes: 0 ok, 1 problems found or partial failure, 2 bad usage or configuration, 130 stopped by Ctrl+C or SIGTERM " +
        "(work committed so far is kept).";

    /// <summary>Parses <paramref name="args"/> and runs the command they name; returns the exit code.</summary>
    /// <param name="run">Runs a command with what the parser found and the settings given as <c>--Section:Key=value</c>.</param>
    public static int Invoke(IReadOnlyList<CommandBase> commands, string[] args, Func<CommandBase, ParseResult, IReadOnlyList<string>, int> run)
    {
        ArgumentNullException.ThrowIfNull(commands);
        ArgumentNullException.ThrowIfNull(args);
        ArgumentNullException.ThrowIfNull(run);
        var overrides = new List<string>();
        var root = Build(commands, (command, parsed) => run(command, parsed, overrides));

        // "indexkeeper help [COMMAND]" as well as "indexkeeper [COMMAND] --help".
        if (args is ["help", .. var asked])
        {
            args = [.. asked, "--help"];
        }

        var (rest, settings) = SettingOverrides.Split(args, OptionNames(root));
        overrides.AddRange(settings);
        var parsed = root.Parse(rest, new ParserConfiguration { ResponseFileTokenReplacer = null });
        var invocation = new InvocationConfiguration { EnableDefaultExceptionHandler = false, ProcessTerminationTimeout = null };
        if (parsed.Action is ParseErrorAction error)
        {
            // Errors and suggestions go to stderr, so stdout stays empty (or JSON) whatever was mistyped.
            error.ShowHelp = rest.Length == 0;
            error.ShowTypoCorrections = true;
            invocation.Output = Console.Error;
            parsed.Invoke(invocation);
            if (rest.Length > 0)
            {
                var command = parsed.CommandResult.Command;
                Console.Error.WriteLine(command is RootCommand ? "See 'indexkeeper --help'." : $"See 'indexkeeper {command.Name} --help'.");
            }

            return UsageExitCode;
        }

        return parsed.Invoke(invocation);
    }

    /// <summary>The root command with every subcommand (the completion directive answers from it too).</summary>
    private static RootCommand Build(IReadOnlyList<CommandBase> commands, Func<CommandBase, ParseResult, int> run)
    {
        ArgumentNullException.ThrowIfNull(commands);
        var root = new RootCommand(Description);
        foreach (var option in CommonOptions.All)
        {
            root.Options.Add(option);
        }

        root.Options.OfType<VersionOption>().Single().Action = new VersionAction();
        foreach (var command in commands)
        {
            var sub = new Command(command.Name, command.Summary);
            foreach (var symbol in command.Symbols)
            {
                switch (symbol)
                {
                    case Option option:
                        sub.Options.Add(option);
                        break;
                    case Argument argument:
                        sub.Arguments.Add(argument);
                        break;
                    default:
                        throw new InvalidOperationException($"{command.Name}: {symbol.Name} is neither an option nor an argument.");
                }
            }

            sub.SetAction(parsed => run(command, parsed));
            root.Subcommands.Add(sub);
        }

        return root;
    }

    private static HashSet<string> OptionNames(RootCommand root) =>
        root.Options.Concat(root.Subcommands.SelectMany(c => c.Options)).SelectMany(o => o.Aliases.Append(o.Name)).ToHashSet(StringComparer.Ordinal);
}
