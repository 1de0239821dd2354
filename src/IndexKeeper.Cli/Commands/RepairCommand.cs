using IndexKeeper.Cli.Output;
using IndexKeeper.Core.Index;

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
        using var composed = context.OpenExisting(Name);
        var index = composed.Index;
        var segments = Path.Combine(index.Directory, VectorStore.SegmentsFolder);
        var damage = DamageSurvey.Run(index.Catalog, segments, null, readRecords: true, cancellationToken);
        var done = DamageRepair.Run(index.Catalog, segments, damage);
        if (context.Json)
        {
            JsonOutput.Write(new { repairs = done, segmentsDamaged = damage.Segments.Count });
        }
        else
        {
            foreach (var line in done)
            {
                Console.Out.WriteLine("  " + line);
            }

            Console.Out.WriteLine(done.Count == 0 ? "Nothing to repair." : "Repaired; `indexkeeper sync` embeds the queued pages again.");
        }

        return done.Count == 0 ? 0 : 1;
    }
}
