using System.CommandLine;
using IndexKeeper.Service.WorkQueue;

namespace IndexKeeper.Cli.Commands;

/// <summary>
/// <c>worker --config FILE</c>: embeds pages for a coordinator (<c>run</c> with Queue:Connection) on this
/// machine; its Roots give this machine's path of each root name. It never opens an index.
/// </summary>
internal sealed class WorkerCommand() : CommandBase(
    "worker",
    "embed pages for a coordinator's work queue in PostgreSQL (Queue:Connection); Roots give this machine's path of each root")
{
    private readonly Option<bool> untilIdle = new("--until-idle")
    {
        Description = "exit (0) at the first claim that finds no job, instead of waiting for more",
    };

    public override IEnumerable<Symbol> Symbols => [untilIdle];

    public override int Run(CommandContext context, CancellationToken cancellationToken) =>
        WorkerHost.Run(context.LoadOptions(), context.Value(untilIdle), cancellationToken);
}
