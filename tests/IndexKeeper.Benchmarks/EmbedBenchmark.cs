using IndexKeeper.Core.Index;
using IndexKeeper.Core.Queue;
using IndexKeeper.Demo;
using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Pipeline;
using IndexKeeper.Service.Application;
using IndexKeeper.Service.Configuration;

namespace IndexKeeper.Benchmarks;

/// <summary>
/// A first <c>sync</c> of the demo store with the hashed-term encoder, through the same session, reader
/// worker, scan pass and embed pass as the command: pages per second, and where the time goes — scan
/// (walk, hash, read in the worker, page keys, catalog), encoder, and store append (segment bytes,
/// fsync, catalog commit), the last timed alone by appending the same vector sets to a fresh index.
/// </summary>
public sealed class EmbedBenchmark : IBenchmark
{
    public string Name => "embed";

    public void Run(BenchmarkContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        var storeDirectory = Path.Combine(context.WorkDirectory, "store");
        var roots = context.Quick ? SmokeStore(storeDirectory) : DemoRoots(context, storeDirectory);
        var overrides = new List<string> { "Detect:SettleSeconds=0", "Encoder:Name=hashed-terms" };
        for (var i = 0; i < roots.Count; i++)
        {
            overrides.Add($"Roots:{i}:Name={roots[i].Name}");
            overrides.Add($"Roots:{i}:Path={roots[i].Path}");
        }

        var options = OptionsLoader.Load(new ConfigurationSources(null, Path.Combine(context.WorkDirectory, "index"), [], overrides));
        using var composed = IndexComposition.Open(options, "benchmark embed");
        var session = composed.Index;
        var encoder = new RecordingEncoder(session.Encoder);
        var store = session.Store; // opened (and its recovery run) before the clock starts
        ScanSummary summary = null!;
        var (scan, scanCpu) = Measure.Once(() => summary = composed.Get<ScanOperation>().Walk("benchmark", composed.Settings.Scan.Roots, CancellationToken.None));
        // The embed pass itself, around an encoder that records its batches (the store append is replayed from them).
        var (embed, embedCpu) = Measure.Once(() =>
            new EmbedPass(session.Catalog, store, session.Words, encoder, composed.Settings.RootPaths, composed.Settings.EmbedBatchSize).Run(summary, CancellationToken.None));
        if (summary.PagesEmbedded != summary.PagesNew || summary.PagesFailed != 0 || summary.DocumentsQuarantined != 0)
        {
            throw new InvalidOperationException($"sync embedded {summary.PagesEmbedded} of {summary.PagesNew} new pages, {summary.PagesFailed} failed, {summary.DocumentsQuarantined} quarantined");
        }

        var (append, appendCpu, bytes) = AppendAgain(Path.Combine(context.WorkDirectory, "replay"), encoder);
        var keys = encoder.Batches.SelectMany(b => b).Select(p => p.Key.Hex).ToList();
        var (pageReads, _) = Measure.Once(() => keys.ForEach(k => _ = session.Catalog.Pages.Find(k) ?? throw new InvalidOperationException(k)));
        var (queueDrain, _) = Measure.Once(() => DrainAgain(session.Catalog, keys, options.Encoder.BatchSize));
        var total = scan + embed;
        context.Report("documents", summary.DocumentsSeen, "files");
        context.Report("pages seen", summary.PagesSeen, "pages");
        context.Report("pages embedded (distinct page keys)", summary.PagesEmbedded, "pages");
        context.Report("vectors written", summary.VectorsWritten, "vectors");
        context.Report("sync, pages embedded per second (scan + embed)", summary.PagesEmbedded / total, "pages/s");
        context.Report("scan pass (walk, hash, read in the worker, page keys, catalog)", scan, "s");
        context.Report("embed pass (queue, encoder, store append, commit)", embed, "s");
        context.Report("  of which encoder calls", summary.EncoderSeconds, "s");
        context.Report("  of which store append + commit (timed alone, fresh index)", append, "s");
        context.Report("  rest: queue and page records from the catalog", embed - summary.EncoderSeconds - append, "s");
        context.Report("    page records with their words, one read per page (timed alone)", pageReads, "s");
        context.Report($"    queue: take {options.Encoder.BatchSize} at a time and dequeue (timed alone)", queueDrain, "s");
        context.Report("share of sync time: scan", scan / total, "share");
        context.Report("share of sync time: encoder", summary.EncoderSeconds / total, "share");
        context.Report("share of sync time: store append + commit", append / total, "share");
        context.Report("scan rate", summary.PagesSeen / scan, "pages/s");
        context.Report("encoder rate", summary.PagesEmbedded / summary.EncoderSeconds, "pages/s");
        context.Report("store append rate", bytes / 1e6 / append, "MB/s");
        context.Report("scan pass, cpu of this process (the reader worker not counted)", scanCpu, "s");
        context.Report("embed pass, cpu", embedCpu, "s");
        context.Report("store append + commit, cpu", appendCpu, "s");
    }

    /// <summary>The demo store (40 documents, 413 pages), generated into <paramref name="directory"/>; its roots.</summary>
    internal static List<DemoRoot> DemoRoots(BenchmarkContext context, string directory)
    {
        DemoStoreInfo info = null!;
        var (generated, _) = Measure.Once(() => info = DemoStore.Generate(directory));
        context.Note($"demo store: {info.DocumentCount} documents, {info.PageCount} pages in {info.Roots.Count} roots, generated in {generated:0.0} s");
        return [.. info.Roots];
    }

    /// <summary>The smoke run's store: the demo store takes longer to generate than the whole smoke run may, so a few generated reports stand in.</summary>
    internal static List<DemoRoot> SmokeStore(string directory)
    {
        var root = Path.Combine(directory, "reports");
        Directory.CreateDirectory(root);
        for (var d = 0; d < 8; d++)
        {
            File.WriteAllBytes(Path.Combine(root, $"report-{d}.pdf"), GeneratedReport.Build(d, new int[3], wordsPerPage: 200));
        }

        return [new DemoRoot("reports", root)];
    }

    /// <summary>Queues the keys again and drains the queue batch by batch as the embed pass does, without encoding.</summary>
    private static void DrainAgain(IndexCatalog catalog, List<string> keys, int batchSize)
    {
        var edit = new CatalogEdit();
        var now = DateTime.UtcNow;
        edit.Enqueue.AddRange(keys.Select(k => new QueueRecord { Id = k, Priority = QueuePriority.Fresh, EnqueuedUtc = now, NotBeforeUtc = now }));
        catalog.Apply(edit);
        while (catalog.Queue.Next(batchSize, now) is { Count: > 0 } batch)
        {
            catalog.Queue.Remove(batch.Select(q => q.Id));
        }
    }

    /// <summary>The vector sets the sync made, appended in the same batches to a fresh index (bytes made durable, then committed).</summary>
    private static (double Wall, double Cpu, long Bytes) AppendAgain(string indexDirectory, RecordingEncoder encoder)
    {
        using var heldLock = IndexLock.Acquire(indexDirectory, "benchmark embed replay");
        using var catalog = IndexCatalog.Open(heldLock);
        using var store = VectorStore.Open(catalog, indexDirectory);
        var (wall, cpu) = Measure.Once(() => encoder.Batches.ForEach(batch => store.AppendAndCommit(encoder.Identity, batch)));
        return (wall, cpu, catalog.Segments.All().Sum(s => s.Length));
    }
}
