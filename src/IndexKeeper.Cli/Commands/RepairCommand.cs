using IndexKeeper.Core.Index;
using IndexKeeper.Service.Application;

namespace IndexKeeper.Cli.Commands;

/// <summary>
/// <c>repair</c>: the explicit repair of damage <c>verify</c> reports (docs/recovery.md): drops vector sets
/// that cannot be read and queues their pages again, takes missing or unreadable files out of the catalog
/// (a damaged file is moved aside, never deleted), re-seals a bad seal over good records. Says what it
/// dropped; exit 1 when it changed anything, 0 when there was nothing to repair.
/// </summary>
internal sealed class RepairCommand() : CommandBase(
    "repair",
    "drop what verify found unreadable (its pages are queued again) and re-seal bad seals; says what it dropped")
{
    public override int Run(CommandContext context, CancellationToken cancellationToken)
    {
        // The store is not opened: its open would repair on its own guesses before this command's survey.
        using var composed = context.OpenExisting(Name);
        var segments = Path.Combine(composed.Index.Directory, VectorStore.SegmentsFolder);
        var damage = DamageSurvey.Run(composed.Index.Catalog, segments, null, readRecords: true, cancellationToken);
        var repairs = DamageRepair.Run(composed.Index.Catalog, segments, damage);
        return context.Print(new RepairReport(repairs, damage.Segments.Count), Write, repairs.Count == 0 ? 0 : 1);
    }

    private static void Write(TextWriter o, RepairReport report)
    {
        foreach (var line in report.Repairs)
        {
            o.WriteLine("  " + line);
        }

        o.WriteLine(report.Repairs.Count == 0 ? "Nothing to repair." : "Repaired; `indexkeeper sync` embeds the queued pages again.");
    }
}
