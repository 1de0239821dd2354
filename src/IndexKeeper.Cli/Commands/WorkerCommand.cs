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
    public override int Run(CommandContext context, CancellationToken cancellationToken) =>
        WorkerHost.Run(context.LoadOptions(), cancellationToken);
}
