using IndexKeeper.Core.Pipeline;
using IndexKeeper.Service.Application;

namespace IndexKeeper.Cli.Commands;

/// <summary><c>sync</c>: one foreground pass — detect, read, diff, embed everything queued, commit.</summary>
internal sealed class SyncCommand() : PassCommand(
    "sync",
    "one pass in the foreground: scan, then embed every queued page and commit")
{
    protected override ScanSummary Pass(IndexComposition composed, IProgress<ScanProgress> progress, CancellationToken cancellationToken) =>
        composed.Get<SyncOperation>().Run(Name, progress, cancellationToken);
}
