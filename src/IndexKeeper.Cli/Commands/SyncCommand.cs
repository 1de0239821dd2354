using IndexKeeper.Cli.Output;
using IndexKeeper.Service.Application;

namespace IndexKeeper.Cli.Commands;

/// <summary><c>sync</c>: one foreground pass — detect, read, diff, embed everything queued, commit.</summary>
internal sealed class SyncCommand() : CommandBase(
    "sync",
    "one pass in the foreground: scan, then embed every queued page and commit")
{
    public override int Run(CommandContext context, CancellationToken cancellationToken)
    {
        using var composed = context.Open(Name);
        var summary = TerminalProgress.Around(progress => composed.Get<SyncOperation>().Run(Name, progress, cancellationToken));
        return context.Print(summary, SummaryText.Write, summary.RootsMissing.Count > 0 || summary.PagesFailed > 0 ? 1 : 0);
    }
}
