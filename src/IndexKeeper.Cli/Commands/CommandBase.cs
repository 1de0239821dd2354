namespace IndexKeeper.Cli.Commands;

/// <summary>A command's name, one-line summary and own options in its declaration; no own options or flags unless it lists some.</summary>
internal abstract class CommandBase(string name, string summary, params string[] options) : ICommand
{
    public string Name => name;

    public string Summary => summary;

    public IReadOnlySet<string> Options { get; } = new HashSet<string>(options);

    public virtual IReadOnlySet<string> Flags { get; } = new HashSet<string>();

    public abstract int Run(CommandContext context, CancellationToken cancellationToken);
}
