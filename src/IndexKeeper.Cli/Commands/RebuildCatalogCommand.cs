using System.Globalization;
using IndexKeeper.Cli.CommandLine;
using IndexKeeper.Cli.Output;
using IndexKeeper.Core.Index;
using IndexKeeper.Core.Pipeline;
using IndexKeeper.Service.Hosting;

namespace IndexKeeper.Cli.Commands;

/// <summary>
/// <c>rebuild-catalog</c>: a new catalog from the segment files plus a scan of the roots (docs/recovery.md).
/// Embeds nothing: pages whose vectors survive are found by page key; the others are queued for the next
/// <c>sync</c>. The configured encoder is the active one and must have vectors in the segments (else exit 2,
/// nothing changed), so a rebuild never silently serves another encoder.
/// </summary>
internal sealed class RebuildCatalogCommand : ICommand
{
    public string Name => "rebuild-catalog";

    public string Summary => "rebuild a lost or damaged catalog from the segments and a scan of the roots; embeds nothing, the old catalog is kept aside";

    public IReadOnlySet<string> Options { get; } = new HashSet<string>();

    public int Run(CommandContext context, CancellationToken cancellationToken)
    {
        var options = context.LoadOptions(rootsRequired: true);
        var segments = Path.Combine(options.IndexDirectory, VectorStore.SegmentsFolder);
        if (!Directory.Exists(segments))
        {
            throw new UsageException($"There are no segments at '{segments}' to rebuild a catalog from; `sync` builds a new index.");
        }

        var encoderId = EncoderFactory.Create(options.Encoder) is var encoder ? encoder.Identity.Id : string.Empty;
        (encoder as IDisposable)?.Dispose();
        var found = CatalogRebuilder.EncodersIn(segments);
        if (found.Count > 0 && !found.ContainsKey(encoderId))
        {
            throw new UsageException(
                $"The configured encoder '{options.Encoder.Name}' ({encoderId[..16]}…) has no vectors in these segments; they hold {string.Join(", ", found.Select(f => f.Key[..16] + "… d=" + f.Value.ToString(CultureInfo.InvariantCulture)))}. " +
                "Set Encoder (--encoder or the configuration) to the one that built the index; nothing was changed.");
        }

        string? movedTo = null;
        using var session = IndexSession.OpenForRebuild(options, "indexkeeper rebuild-catalog", directory => movedTo = CatalogRebuilder.MoveCatalogAside(directory, DateTime.UtcNow));
        var rebuild = CatalogRebuilder.Restore(session.Catalog, segments, cancellationToken);
        rebuild.OldCatalogMovedTo = movedTo;
        session.Catalog.Encoders.Register(session.Encoder.Identity, EncoderSettings.Record(options.Encoder));
        ScanSummary scan;
        using (var progress = new TerminalProgress())
        {
            scan = new ScanPass(session.Catalog, session.Reader, session.ScanSettings(), progress).Run(Name, cancellationToken);
        }

        CatalogRebuilder.DequeueCovered(session.Catalog, session.Encoder.Identity.Id);
        scan.RecordDrift(session.ReconcileDrift());
        var figures = session.Catalog.Figures();
        var summary = new
        {
            oldCatalogMovedTo = rebuild.OldCatalogMovedTo,
            segmentsRestored = rebuild.SegmentsRestored,
            vectorSetsRestored = rebuild.VectorSetsRestored,
            liveVectorSets = session.Catalog.VectorSets.Count(liveOnly: true),
            duplicateRecords = rebuild.DuplicateRecords,
            documentsSeen = scan.DocumentsSeen,
            pagesSeen = scan.PagesSeen,
            pagesQueued = figures.Queued,
            pagesEmbedded = 0,
            problems = rebuild.Problems,
        };
        if (context.Json)
        {
            JsonOutput.Write(summary);
        }
        else
        {
            var o = Console.Out;
            o.WriteLine(movedTo is null ? "No old catalog was there." : $"The old catalog was moved to {movedTo} (kept).");
            o.WriteLine(string.Create(CultureInfo.InvariantCulture, $"Took back {summary.segmentsRestored} segment(s) and {summary.vectorSetsRestored} vector set(s); {summary.liveVectorSets} are live after a scan of {summary.documentsSeen} document(s), {summary.pagesSeen} page(s)."));
            o.WriteLine(string.Create(CultureInfo.InvariantCulture, $"0 pages embedded; {summary.pagesQueued} page(s) without vectors queued for `indexkeeper sync`."));
            foreach (var problem in rebuild.Problems)
            {
                o.WriteLine("  problem: " + problem);
            }
        }

        return rebuild.Problems.Count > 0 || scan.RootsMissing.Count > 0 ? 1 : 0;
    }
}
