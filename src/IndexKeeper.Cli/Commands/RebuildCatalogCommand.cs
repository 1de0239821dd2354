using System.Globalization;
using IndexKeeper.Cli.CommandLine;
using IndexKeeper.Cli.Output;
using IndexKeeper.Core.Index;
using IndexKeeper.Service.Application;
using IndexKeeper.Service.Hosting;

namespace IndexKeeper.Cli.Commands;

/// <summary>
/// <c>rebuild-catalog</c>: a new catalog from the segment files plus a scan of the roots (docs/recovery.md).
/// Embeds nothing: pages whose vectors survive are found by page key; the others are queued for the next
/// <c>sync</c>. The configured encoder is the active one and must have vectors in the segments (else exit 2,
/// nothing changed), so a rebuild never silently serves another encoder.
/// </summary>
internal sealed class RebuildCatalogCommand() : CommandBase(
    "rebuild-catalog",
    "rebuild a lost or damaged catalog from the segments and a scan of the roots; embeds nothing, the old catalog is kept aside")
{
    public override int Run(CommandContext context, CancellationToken cancellationToken)
    {
        var options = context.LoadOptions(rootsRequired: true);
        var segments = Path.Combine(options.IndexDirectory, VectorStore.SegmentsFolder);
        if (!Directory.Exists(segments))
        {
            throw new UsageException($"There are no segments at '{segments}' to rebuild a catalog from; `sync` builds a new index.");
        }

        var settings = IndexSettings.From(options);
        var encoderId = EncoderFactory.Create(settings.Encoder) is var encoder ? encoder.Identity.Id : string.Empty;
        (encoder as IDisposable)?.Dispose();
        var found = CatalogRebuilder.EncodersIn(segments);
        if (found.Count > 0 && !found.ContainsKey(encoderId))
        {
            throw new UsageException(
                $"The configured encoder '{options.Encoder.Name}' ({encoderId[..16]}…) has no vectors in these segments; they hold {string.Join(", ", found.Select(f => f.Key[..16] + "… d=" + f.Value.ToString(CultureInfo.InvariantCulture)))}. " +
                "Set the encoder (--encoder or the configuration) to the one that built the index; nothing was changed.");
        }

        string? movedTo = null;
        using var composed = IndexComposition.OpenForRebuild(options, "indexkeeper " + Name, directory => movedTo = CatalogRebuilder.MoveCatalogAside(directory, DateTime.UtcNow));
        var catalog = composed.Index.Catalog;
        var rebuild = CatalogRebuilder.Restore(catalog, segments, cancellationToken);
        catalog.Encoders.Register(composed.Index.Encoder.Identity, settings.EncoderRecord);
        var scan = TerminalProgress.Around(progress => composed.Get<ScanOperation>().Run(Name, progress, cancellationToken));

        CatalogRebuilder.DequeueCovered(catalog, composed.Index.Encoder.Identity.Id);
        var report = new RebuildCatalogReport(
            movedTo,
            rebuild.SegmentsRestored,
            rebuild.VectorSetsRestored,
            catalog.VectorSets.Count(liveOnly: true),
            rebuild.DuplicateRecords,
            scan.DocumentsSeen,
            scan.PagesSeen,
            catalog.Figures().Queued,
            PagesEmbedded: 0,
            rebuild.FilesTakenBack,
            rebuild.Problems);
        return context.Print(report, Write, rebuild.Problems.Count > 0 || scan.RootsMissing.Count > 0 ? 1 : 0);
    }

    private static void Write(TextWriter o, RebuildCatalogReport r)
    {
        var c = CultureInfo.InvariantCulture;
        o.WriteLine(r.OldCatalogMovedTo is null ? "No old catalog was there." : $"The old catalog was moved to {r.OldCatalogMovedTo} (kept).");
        o.WriteLine(string.Create(c, $"Took back {r.SegmentsRestored} segment(s) and {r.VectorSetsRestored} vector set(s); {r.LiveVectorSets} are live after a scan of {r.DocumentsSeen} document(s), {r.PagesSeen} page(s)."));
        o.WriteLine(string.Create(c, $"{r.PagesEmbedded} pages embedded; {r.PagesQueued} page(s) without vectors queued for `indexkeeper sync`."));
        foreach (var taken in r.FilesTakenBack)
        {
            o.WriteLine("  taken back: " + taken);
        }

        foreach (var problem in r.Problems)
        {
            o.WriteLine("  problem: " + problem);
        }
    }
}
