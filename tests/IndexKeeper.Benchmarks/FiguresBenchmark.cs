using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Index;
using IndexKeeper.Core.Queue;

namespace IndexKeeper.Benchmarks;

/// <summary>
/// What one daemon sample after a commit costs (issues 13 and 15), part by part, at 10,000 and 100,000 pages:
/// the catalog recount it made before (every document, page, queue, segment and vector-set record read again)
/// against the running counts it reads now (the commit's records re-read, segments unchanged since a clean
/// inspection skipped). On a copy of the <c>idle</c> benchmark's generated index, with one document per ten
/// pages added so documents are counted too; each round commits one new document of three pages first.
/// </summary>
public sealed class FiguresBenchmark : IBenchmark
{
    private const int Repeats = 5;

    public string Name => "figures";

    public void Run(BenchmarkContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        foreach (var pages in IdleBenchmark.Sizes(context, "IK_FIGURES_PAGES"))
        {
            Size(context, pages);
        }
    }

    private static void Size(BenchmarkContext context, int pages)
    {
        var (cache, name) = IdleBenchmark.Generated(context, pages);
        var directory = Path.Combine(context.WorkDirectory, $"index-{pages}");
        Copy(Path.Combine(cache, "index"), directory);

        using var held = IndexLock.Acquire(directory, "figures benchmark");
        using var catalog = IndexCatalog.Open(held);
        using var store = VectorStore.Open(catalog, directory);
        AddDocuments(catalog);
        var encoder = catalog.Segments.All()[0].EncoderId;
        var round = 0;
        void Commit()
        {
            var edit = new CatalogEdit();
            var keys = Enumerable.Range(0, 3).Select(i => $"figures-{round}-{i}").ToList();
            edit.PutDocuments.Add(new DocumentRecord { Id = DocumentRecord.MakeId("bench", $"round-{round}.txt"), Root = "bench", Path = $"round-{round}.txt", State = DocumentState.Live, Size = 3000, PageKeys = keys });
            edit.AddPages.AddRange(keys.Select(k => new PageRecord { Id = k, References = 1 }));
            edit.Enqueue.AddRange(keys.Select(k => new QueueRecord { Id = k, Priority = QueuePriority.Fresh, EnqueuedUtc = DateTime.UtcNow, NotBeforeUtc = DateTime.UtcNow }));
            catalog.Apply(edit);
            round++;
        }

        context.Note($"{name}: {catalog.Figures().Documents} documents, {catalog.Figures().Pages} pages, {catalog.Segments.All().Count} segments (load {Measure.LoadAverage():0.0})");

        // Before: what Sample read after every commit, part by part.
        Part(context, name, "recount: IndexCatalog.Figures (documents, pages, queue)", () => catalog.Figures(), Commit);
        Part(context, name, "recount: queue depths", () => catalog.Queue.Depths(), Commit);
        Part(context, name, "recount: live vector sets", () => catalog.VectorSets.Count(liveOnly: true), Commit);
        Part(context, name, "recount: segment records", () => catalog.Segments.All(), Commit);
        Part(context, name, "recount: DamageSurvey.Run (cheap)", () => DamageSurvey.Run(catalog, store.Directory, encoder, readRecords: false, CancellationToken.None), Commit);
        Part(context, name, "recount: referenced and live page keys (FigureSurvey)", () =>
        {
            var referenced = catalog.Pages.ReferencedKeys().ToList();
            var live = catalog.VectorSets.LivePageKeysOf(encoder);
            return referenced.LongCount(live.Contains);
        }, Commit);
        Part(context, name, "recount: totals by root (FigureSurvey)", () => catalog.Documents.TotalsByRoot(), Commit);
        var before = Part(context, name, "recount: all of the above", () =>
        {
            _ = catalog.Figures();
            _ = catalog.Queue.Depths();
            _ = catalog.VectorSets.Count(liveOnly: true);
            _ = catalog.Segments.All();
            _ = DamageSurvey.Run(catalog, store.Directory, encoder, readRecords: false, CancellationToken.None);
            _ = catalog.Pages.ReferencedKeys().ToList().LongCount(catalog.VectorSets.LivePageKeysOf(encoder).Contains);
            return catalog.Documents.TotalsByRoot();
        }, Commit);

        // After: the running counts.
        var (_, seed) = Measure.Once(catalog.Counts.Refresh);
        context.Report($"{name}: running: first refresh (one full count, once per process)", seed * 1000, "ms CPU");
        var clean = new CleanSegments();
        Part(context, name, "running: refresh after the commit", () =>
        {
            catalog.Counts.Refresh();
            return catalog.Counts.Figures();
        }, Commit);
        Part(context, name, "running: DamageSurvey.RunRunning", () => DamageSurvey.RunRunning(catalog, store.Directory, encoder, catalog.Counts.Coverage(encoder, encoder), clean, CancellationToken.None), Commit);
        var after = Part(context, name, "running: all a sample reads", () =>
        {
            catalog.Counts.Refresh();
            var coverage = catalog.Counts.Coverage(encoder, encoder);
            _ = catalog.Counts.Figures();
            _ = catalog.Counts.Depths();
            _ = catalog.Segments.All();
            _ = DamageSurvey.RunRunning(catalog, store.Directory, encoder, coverage, clean, CancellationToken.None);
            return catalog.Counts.TotalsByRoot();
        }, Commit);
        context.Report($"{name}: sample after a commit, recount / running", before / after, "x");
        var (_, recount) = Measure.Once(() => catalog.Counts.Recount());
        context.Report($"{name}: running: full recount check (hourly)", recount * 1000, "ms CPU");
    }

    /// <summary>Median CPU of <paramref name="run"/> after a commit each time; reported in ms and returned.</summary>
    private static double Part(BenchmarkContext context, string name, string what, Func<object> run, Action commit)
    {
        var (_, cpu) = Measure.Median(Repeats, () => run(), commit);
        context.Report($"{name}: {what} (load {Measure.LoadAverage():0.0})", cpu * 1000, "ms CPU");
        return cpu * 1000;
    }

    /// <summary>One live document per ten generated pages, holding them (their reference counts are already 1).</summary>
    private static void AddDocuments(IndexCatalog catalog)
    {
        var keys = catalog.Pages.ReferencedKeys().Order(StringComparer.Ordinal).ToList();
        var edit = new CatalogEdit();
        for (var d = 0; d * 10 < keys.Count; d++)
        {
            var held = keys.Skip(d * 10).Take(10).ToList();
            edit.PutDocuments.Add(new DocumentRecord { Id = DocumentRecord.MakeId($"root{d % 4}", $"d{d}.pdf"), Root = $"root{d % 4}", Path = $"d{d}.pdf", State = DocumentState.Live, Size = 100_000, PageKeys = held });
        }

        catalog.Apply(edit);
    }

    private static void Copy(string from, string to)
    {
        Directory.CreateDirectory(to);
        foreach (var file in Directory.EnumerateFiles(from, "*", SearchOption.AllDirectories))
        {
            var target = Path.Combine(to, Path.GetRelativePath(from, file));
            Directory.CreateDirectory(Path.GetDirectoryName(target)!);
            File.Copy(file, target);
        }
    }
}
