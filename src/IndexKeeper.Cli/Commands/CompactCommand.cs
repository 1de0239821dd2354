using System.Globalization;
using IndexKeeper.Service.Application;

namespace IndexKeeper.Cli.Commands;

/// <summary><c>compact</c>: run the compaction policy now and rewrite what it picks.</summary>
internal sealed class CompactCommand() : CommandBase(
    "compact",
    "rewrite segments and page-word files whose dead share or small size makes it worthwhile, now")
{
    public override int Run(CommandContext context, CancellationToken cancellationToken)
    {
        using var composed = context.OpenExisting(Name);
        var report = composed.Get<CompactOperation>().Run(cancellationToken);
        return context.Print(report, (o, r) =>
        {
            o.WriteLine(string.Create(
                CultureInfo.InvariantCulture,
                $"Compaction: {r.Jobs} job(s), {r.SegmentsRewritten} segment(s) rewritten, {r.BytesWritten / 1048576.0:0.0} MiB written, {r.BytesReclaimed / 1048576.0:0.0} MiB reclaimed."));
            o.WriteLine(string.Create(
                CultureInfo.InvariantCulture,
                $"Page words: {r.Words.FilesRewritten} file(s) rewritten, {r.Words.FilesDeleted} emptied file(s) deleted, {r.Words.BytesWritten / 1048576.0:0.0} MiB written, {r.Words.BytesReclaimed / 1048576.0:0.0} MiB reclaimed."));
            foreach (var damaged in r.Words.Damaged)
            {
                o.WriteLine(damaged);
            }
        }, report.Words.Damaged.Count > 0 ? 1 : 0);
    }
}
