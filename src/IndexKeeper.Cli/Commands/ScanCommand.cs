using IndexKeeper.Cli.Output;
using IndexKeeper.Core.Pipeline;
using IndexKeeper.Service.Hosting;

namespace IndexKeeper.Cli.Commands;

/// <summary><c>scan</c>: detect, read and diff every root; queues new page keys and drifted pages, embeds nothing.</summary>
internal sealed class ScanCommand : ICommand
{
    public string Name => "scan";

    public string Summary => "detect, read and diff only: queues pages that need vectors, embeds nothing";

    public IReadOnlySet<string> Options { get; } = new HashSet<string>();

    public int Run(CommandContext context, CancellationToken cancellationToken)
    {
        var options = context.LoadOptions();
        using var session = IndexSession.Open(options, "indexkeeper scan");
        ScanSummary summary;
        using (var progress = new TerminalProgress())
        {
            summary = new ScanPass(session.Catalog, session.Reader, session.ScanSettings(), progress).Run(Name, cancellationToken);
        }

        summary.RecordDrift(session.ReconcileDrift());

        if (context.Json)
        {
            JsonOutput.Write(summary);
        }
        else
        {
            SummaryText.Write(Console.Out, summary);
        }

        return summary.RootsMissing.Count > 0 ? 1 : 0;
    }
}
