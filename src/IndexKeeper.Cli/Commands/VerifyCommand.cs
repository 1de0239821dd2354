using IndexKeeper.Core.Pipeline;
using IndexKeeper.Service.Application;

namespace IndexKeeper.Cli.Commands;

/// <summary><c>verify</c>: integrity of catalog and segments, read only; exit 1 with the list of problems when any.</summary>
internal sealed class VerifyCommand() : CommandBase(
    "verify",
    "integrity check of catalog and segments; reads only; exit 1 on any problem, naming what each damaged file costs")
{
    public override int Run(CommandContext context, CancellationToken cancellationToken)
    {
        using var composed = CommandContext.OpenForReading(context.LoadForExistingIndex());
        var report = composed.Get<VerifyOperation>().Run(cancellationToken);
        return context.Print(report, Write, report.Clean ? 0 : 1);
    }

    private static void Write(TextWriter o, VerifyReport report)
    {
        o.WriteLine($"Checked {report.DocumentsChecked} documents, {report.PagesChecked} pages, {report.SegmentsChecked} segments, {report.VectorSetsChecked} vector sets.");
        foreach (var note in report.Notes)
        {
            o.WriteLine("  note: " + note);
        }

        foreach (var problem in report.Problems)
        {
            o.WriteLine("  problem: " + problem);
        }

        o.WriteLine(report.Clean ? "The index is consistent." : $"{report.Problems.Count} problem(s) found; nothing was changed. `indexkeeper repair` drops what cannot be read and queues its pages again (docs/recovery.md).");
    }
}
