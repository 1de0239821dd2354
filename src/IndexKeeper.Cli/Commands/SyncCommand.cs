using IndexKeeper.Cli.Output;
using IndexKeeper.Core.Pipeline;
using IndexKeeper.Service.Hosting;

namespace IndexKeeper.Cli.Commands;

/// <summary><c>sync</c>: one foreground pass — detect, read, diff, embed everything queued, commit.</summary>
internal sealed class SyncCommand : ICommand
{
    public string Name => "sync";

    public string Summary => "one pass in the foreground: scan, then embed every queued page and commit";

    public IReadOnlySet<string> Options { get; } = new HashSet<string>();

    public int Run(CommandContext context, CancellationToken cancellationToken)
    {
        var options = context.LoadOptions();
        using var session = IndexSession.Open(options, "indexkeeper sync");
        var summary = Sync(session, Name, cancellationToken);
        if (context.Json)
        {
            JsonOutput.Write(summary);
        }
        else
        {
            SummaryText.Write(Console.Out, summary);
        }

        return summary.RootsMissing.Count > 0 || summary.PagesFailed > 0 ? 1 : 0;
    }

    /// <summary>Scan then embed, with progress on stderr; shared with <c>demo</c>.</summary>
    internal static ScanSummary Sync(IndexSession session, string command, CancellationToken cancellationToken)
    {
        using var progress = new TerminalProgress();
        var started = DateTime.UtcNow;
        var store = session.Store;
        var summary = new ScanPass(session.Catalog, session.Reader, session.ScanSettings(), progress).Run(command, cancellationToken);
        summary.RecordDrift(session.ReconcileDrift());
        new EmbedPass(session.Catalog, store, session.Encoder, session.RootPaths, session.Options.Encoder.BatchSize, progress).Run(summary, cancellationToken);
        summary.RecordDrift(session.ReconcileDrift());
        summary.ElapsedSeconds = (DateTime.UtcNow - started).TotalSeconds;
        return summary;
    }
}
