namespace IndexKeeper.Cli.Commands;

/// <summary>One <c>indexkeeper</c> command. Returns the exit code: 0 ok, 1 problems found, 2 bad usage or configuration.</summary>
internal interface ICommand
{
    string Name { get; }

    string Summary { get; }

    /// <summary>Names of the command's own options (without dashes), besides the common ones.</summary>
    IReadOnlySet<string> Options { get; }

    /// <summary>Names of the command's flags (options without a value).</summary>
    IReadOnlySet<string> Flags => new HashSet<string>();

    int Run(CommandContext context, CancellationToken cancellationToken);
}
