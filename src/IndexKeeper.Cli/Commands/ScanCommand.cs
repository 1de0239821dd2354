using IndexKeeper.Core.Pipeline;
using IndexKeeper.Service.Application;

namespace IndexKeeper.Cli.Commands;

/// <summary><c>scan</c>: detect, read and diff every root; queues new page keys and drifted pages, embeds nothing.</summary>
internal sealed class ScanCommand() : PassCommand(
    "scan",
    "detect, read and diff only: queues pages that need vectors, embeds nothing")
{
    protected override ScanSummary Pass(IndexComposition composed, IProgress<ScanProgress> progress, CancellationToken cancellationToken) =>
        composed.Get<ScanOperation>().Run(Name, progress, cancellationToken);
}
