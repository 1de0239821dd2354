using System.Globalization;
using IndexKeeper.Cli.Output;
using IndexKeeper.Service.Hosting;

namespace IndexKeeper.Cli.Commands;

/// <summary><c>compact</c>: run the compaction policy now and rewrite what it picks.</summary>
internal sealed class CompactCommand : ICommand
{
    public string Name => "compact";

    public string Summary => "rewrite segments whose dead share or small size makes it worthwhile, now";

    public IReadOnlySet<string> Options { get; } = new HashSet<string>();

    public int Run(CommandContext context, CancellationToken cancellationToken)
    {
        var options = context.LoadForExistingIndex();
        using var session = IndexSession.Open(options, "indexkeeper compact");
        session.Store.SealAll();
        var report = session.Store.Compact(session.CompactionOptions(), cancellationToken);
        if (context.Json)
        {
            JsonOutput.Write(report);
        }
        else
        {
            Console.Out.WriteLine(string.Create(
                CultureInfo.InvariantCulture,
                $"Compaction: {report.Jobs} job(s), {report.SegmentsRewritten} segment(s) rewritten, {report.BytesWritten / 1048576.0:0.0} MiB written, {report.BytesReclaimed / 1048576.0:0.0} MiB reclaimed."));
        }

        return 0;
    }
}
