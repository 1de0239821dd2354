using System.CommandLine;

namespace IndexKeeper.Cli.Commands;

/// <summary>
/// One <c>indexkeeper</c> command: its name, its one-line summary (the help text), its own options and
/// arguments besides the common ones (<see cref="CommandLine.CommonOptions"/>), and what it does.
/// <see cref="Run"/> returns the exit code: 0 ok, 1 problems found, 2 bad usage or configuration.
/// </summary>
internal abstract class CommandBase(string name, string summary)
{
    public string Name => name;

    public string Summary => summary;

    /// <summary>The command's own options and arguments; none unless it declares some.</summary>
    public virtual IEnumerable<Symbol> Symbols => [];

    public abstract int Run(CommandContext context, CancellationToken cancellationToken);
}
