using IndexKeeper.Cli.Output;
using IndexKeeper.Core.Pipeline;
using IndexKeeper.Service.Application;

namespace IndexKeeper.Cli.Commands;

/// <summary>
/// <c>scan</c> and <c>sync</c>: compose the index, run one pass under a progress bar, print its summary.
/// Exit 1 (partial failure) when a root is missing, a file could not be read or was quarantined in this
/// pass, or the encoder failed on pages (only a sync embeds).
/// </summary>
internal abstract class PassCommand(string name, string summary) : CommandBase(name, summary)
{
    public sealed override int Run(CommandContext context, CancellationToken cancellationToken)
    {
        using var composed = context.Open(Name);
        var summary = TerminalProgress.Around(progress => Pass(composed, progress, cancellationToken));
        return context.Print(summary, SummaryText.Write, PartialFailure(summary) ? 1 : 0);
    }

    private static bool PartialFailure(ScanSummary summary) =>
        summary.RootsMissing.Count > 0 || summary.PagesFailed > 0 || summary.FilesUnreadable > 0 || summary.DocumentsQuarantined > 0;

    /// <summary>The pass's use case, called on the composed index.</summary>
    protected abstract ScanSummary Pass(IndexComposition composed, IProgress<ScanProgress> progress, CancellationToken cancellationToken);
}
