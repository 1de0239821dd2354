using IndexKeeper.Cli.Output;
using IndexKeeper.Core.Pipeline;
using IndexKeeper.Service.Hosting;

namespace IndexKeeper.Cli.Commands;

/// <summary><c>verify</c>: integrity of catalog and segments; exit 1 with the list of problems when any.</summary>
internal sealed class VerifyCommand : ICommand
{
    public string Name => "verify";

    public string Summary => "integrity check of catalog and segments; reads only; exit 1 on any problem, naming what each damaged file costs";

    public IReadOnlySet<string> Options { get; } = new HashSet<string>();

    public int Run(CommandContext context, CancellationToken cancellationToken)
    {
        var options = context.LoadForExistingIndex();
        using var session = IndexSession.OpenReadOnly(options, "indexkeeper verify");
        var report = IndexVerifier.Verify(session.Catalog, session.Store.Directory, session.Encoder.Identity.Id, cancellationToken);
        if (context.Json)
        {
            JsonOutput.Write(report);
        }
        else
        {
            var o = Console.Out;
            o.WriteLine($"Checked {report.DocumentsChecked} documents, {report.PagesChecked} pages, {report.SegmentsChecked} segments, {report.VectorSetsChecked} vector sets.");
            foreach (var problem in report.Problems)
            {
                o.WriteLine("  problem: " + problem);
            }

            o.WriteLine(report.Clean ? "The index is consistent." : $"{report.Problems.Count} problem(s) found; nothing was changed. `indexkeeper repair` drops what cannot be read and queues its pages again (docs/recovery.md).");
        }

        return report.Clean ? 0 : 1;
    }
}
