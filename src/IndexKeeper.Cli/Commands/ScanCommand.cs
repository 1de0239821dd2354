using IndexKeeper.Cli.Output;
using IndexKeeper.Service.Application;

namespace IndexKeeper.Cli.Commands;

/// <summary><c>scan</c>: detect, read and diff every root; queues new page keys and drifted pages, embeds nothing.</summary>
internal sealed class ScanCommand() : CommandBase(
    "scan",
    "detect, read and diff only: queues pages that need vectors, embeds nothing")
{
    public override int Run(CommandContext context, CancellationToken cancellationToken)
    {
        using var composed = context.Open(Name);
        var summary = TerminalProgress.Around(progress => composed.Get<ScanOperation>().Run(Name, progress, cancellationToken));
        return context.Print(summary, SummaryText.Write, summary.RootsMissing.Count > 0 ? 1 : 0);
    }
}
