using System.Diagnostics;
using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Index;
using IndexKeeper.Core.Search;
using IndexKeeper.Core.Storage;
using IndexKeeper.Service.Application;

namespace IndexKeeper.Benchmarks;

/// <summary>
/// Search at the size of a drive (issue 13): real catalogs and segments of 10,000 and 100,000 generated pages
/// (60–200 words a page through the hashed-term encoder, d = 128), searched three ways in the same run: the path before the serving
/// view (catalog read, sign codes over every page, float16 re-rank of 100), the serving view (candidate graph of
/// fixed dimensional encodings, float16 re-rank of the candidates), and exhaustive float16 MaxSim (the
/// reference for agreement). Also the cost of a first search in a new process, of keeping the view up to date
/// per commit, and its bytes per page.
/// </summary>
public sealed class ServingBenchmark : IBenchmark
{
    private const int MinWords = 60;
    private const int MaxWords = 200;
    private const int QueryWords = 3;
    private const int BatchPages = 500;

    // Pages whose records are written again in two side catalogs to compare the two places of words.
    private const int WordSample = 5_000;

    public string Name => "serving";

    public void Run(BenchmarkContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        foreach (var pages in context.Quick ? new[] { 600, 2_400 } : [10_000, 100_000])
        {
            Size(context, pages);
        }
    }

    private static void Size(BenchmarkContext context, int pages)
    {
        var directory = Path.Combine(context.WorkDirectory, pages.ToString(System.Globalization.CultureInfo.InvariantCulture));
        Directory.CreateDirectory(directory);
        var corpus = new TermCorpus(seed: pages, MinWords, MaxWords, QueryWords);
        var identity = corpus.Identity;
        var name = $"{pages / 1000}k";
        using var held = IndexLock.Acquire(directory, "serving benchmark");
        using var catalog = IndexCatalog.Open(held);
        using var store = VectorStore.Open(catalog, directory);
        using var wordStore = PageWordStore.OpenForWriting(directory);
        var sample = new List<(PageKey Key, PageWord[] Words, WordsAtRecord At)>();
        var (fill, _) = Measure.Once(() =>
        {
            for (var at = 0; at < pages; at += BatchPages)
            {
                var batch = Enumerable.Range(at, Math.Min(BatchPages, pages - at)).Select(i => (Key: KeyOf(i), Made: corpus.PageAndWords(i))).ToList();
                var records = AddPages(catalog, wordStore, [.. batch.Select(b => (b.Key, b.Made.Words))]);
                sample.AddRange(batch.Zip(records).Take(Math.Max(0, WordSample - sample.Count)).Select(p => (p.First.Key, p.First.Made.Words, p.Second.WordsAt!)));
                store.AppendAndCommit(identity, [.. batch.Select(b => (b.Key, b.Made.Vectors))]);
            }

            store.SealAll();
        });
        var vectors = catalog.VectorSets.VectorCounts(identity.Id).Vectors;
        context.Note($"{name}: {pages} pages, {vectors} vectors ({(double)vectors / pages:0.0} a page), queries of {QueryWords} words; written in {fill:0.0} s");
        CatalogBytes(context, name, directory, pages, sample);
        context.Report($"{name}: segment bytes per page", (double)FileSizes(Path.Combine(directory, VectorStore.SegmentsFolder), "*") / pages, "B");

        // The serving view, built from the whole catalog once (a writer that finds no file does this).
        var memoryBefore = Resident();
        var managedBefore = GC.GetTotalMemory(forceFullCollection: true);
        using var views = new ServingViews(catalog, () => store, directory, readOnly: false);
        var (build, buildCpu) = Measure.Once(() => views.For(identity.Id, CancellationToken.None));
        var resident = Resident() - memoryBefore;
        var managed = GC.GetTotalMemory(forceFullCollection: true) - managedBefore;
        context.Report($"{name}: serving view build from the catalog, wall", build, "s");
        context.Report($"{name}: serving view build, CPU", buildCpu, "s");
        context.Report($"{name}: working set growth per page over the build (includes segment pages mapped while reading)", (double)resident / pages, "B");
        context.Report($"{name}: serving view managed heap per page (directory)", (double)managed / pages, "B");
        var (persist, _) = Measure.Once(() => views.Persist(CancellationToken.None));
        context.Report($"{name}: serving view written to disk, wall", persist, "s");
        context.Report($"{name}: serving view on disk, bytes per page (directory + graph)", (double)FileSizes(Path.Combine(directory, ServingViewFile.Folder), "*") / pages, "B");
        context.Report($"{name}: candidate graph bytes per page (its file; the same layout is held in memory)", (double)FileSizes(Path.Combine(directory, ServingViewFile.Folder), "*.graph") / pages, "B");

        var queryCount = context.Quick ? 6 : 30;
        var queries = Enumerable.Range(0, queryCount).Select(i => corpus.Query(i * (pages / queryCount / 97) * 97)).ToArray();
        var exhaustive = new List<double>();
        var before = new List<double>();
        var serving = new List<double>();
        var servingGraph = new List<double>();
        var truths = new List<Truth>();
        double agreeBefore = 0, agreeServing = 0, tiedBefore = 0, tiedServing = 0, agreeAll = 0;
        foreach (var query in queries)
        {
            var watch = Stopwatch.StartNew();
            using (var live = store.OpenLive(identity.Id))
            {
                var truth = LateInteractionSearch.Search(live.Source, query, new SearchOptions { Top = 10, Candidates = int.MaxValue }, CancellationToken.None);
                exhaustive.Add(watch.Elapsed.TotalMilliseconds);
                truths.Add(new Truth([.. truth.Hits.Select(h => h.Key.Hex)], truth.Hits.Count < 10 ? float.NegativeInfinity : truth.Hits[9].Score));
            }

            // The path before the serving view: the live list read from the catalog, every page's sign codes.
            watch.Restart();
            using (var live = store.OpenLive(identity.Id))
            {
                var hits = LateInteractionSearch.Search(live.Source, query, new SearchOptions { Top = 10 }, CancellationToken.None).Hits;
                before.Add(watch.Elapsed.TotalMilliseconds);
                agreeBefore += truths[^1].Overlap(hits);
                tiedBefore += truths[^1].AtLeastTenth(hits);
            }

            watch.Restart();
            var found = views.Search(identity.Id, query, 10, fromGraph: true, CancellationToken.None).Result.Hits;
            servingGraph.Add(watch.Elapsed.TotalMilliseconds);
            watch.Restart();
            var all = views.Search(identity.Id, query, 10, fromGraph: false, CancellationToken.None).Result.Hits;
            serving.Add(watch.Elapsed.TotalMilliseconds);
            agreeServing += truths[^1].Overlap(found);
            tiedServing += truths[^1].AtLeastTenth(found);
            agreeAll += truths[^1].Overlap(all);
        }

        Latency(context, $"{name}: exhaustive float16 MaxSim", exhaustive);
        Latency(context, $"{name}: before (catalog read + sign codes of every page + re-rank of 100)", before);
        Latency(context, $"{name}: serving view, candidates all (sign codes of every page, re-rank of {CandidateCounts.Reranked(10, pages)})", serving);
        Latency(context, $"{name}: serving view, candidates graph ({CandidateCounts.FromGraph(10, pages)}, sign codes, re-rank of {CandidateCounts.Reranked(10, pages)})", servingGraph);
        context.Report($"{name}: speedup over exhaustive, p50, candidates all / graph", Median(exhaustive) / Median(serving), $"{Median(exhaustive) / Median(servingGraph):0.00}");
        context.Report($"{name}: speedup over before, p50, candidates all / graph", Median(before) / Median(serving), $"{Median(before) / Median(servingGraph):0.00}");
        context.Report($"{name}: top-10 agreement with exhaustive, before", agreeBefore / queries.Length, "share");
        context.Report($"{name}: top-10 agreement with exhaustive, serving view, candidates all", agreeAll / queries.Length, "share");
        context.Report($"{name}: top-10 agreement with exhaustive, serving view, candidates graph", agreeServing / queries.Length, "share");
        context.Report($"{name}: top-10 agreement counting ties at the 10th score, before", tiedBefore / queries.Length, "share");
        context.Report($"{name}: top-10 agreement counting ties at the 10th score, serving view, candidates graph", tiedServing / queries.Length, "share");
        Agreement(context, name, views.For(identity.Id, CancellationToken.None), store, identity.Id, queries, truths, pages);

        FirstSearch(context, name, catalog, directory, identity.Id, queries[0]);
        Churn(context, name, catalog, store, views, identity, corpus, pages);
    }

    /// <summary>
    /// Top-10 agreement and latency of the serving view's two stages at other counts: pages from the candidate
    /// graph (or every page) × pages the sign-code stage hands to the float re-rank. The product's counts
    /// (<see cref="CandidateCounts"/>) are chosen from these rows.
    /// </summary>
    private static void Agreement(BenchmarkContext context, string name, ServingView view, VectorStore store, string encoderId, VectorSet[] queries, List<Truth> truths, int pages)
    {
        int[] reranked = [100, 1000, 3000];
        foreach (var fromGraph in new int?[] { 2000, 5000, 10_000, null })
        {
            if (fromGraph >= pages)
            {
                continue;
            }

            // Every graph candidate re-ranked exactly: the sign-code stage skipped.
            foreach (var rerank in reranked.Where(r => r < (fromGraph ?? pages)).Append(fromGraph ?? 0).Where(r => r > 0))
            {
                double agree = 0, tied = 0;
                var latency = new List<double>();
                for (var i = 0; i < queries.Length; i++)
                {
                    var watch = Stopwatch.StartNew();
                    var candidates = fromGraph is { } count ? view.Candidates(queries[i], count) : view.Entries();
                    using var live = store.OpenSelected(encoderId, [.. candidates.Select(c => new VectorSetRecord
                    {
                        EncoderId = encoderId, PageKey = c.Key.Hex, SegmentId = c.Location.SegmentId, Offset = c.Location.Offset, Length = c.Location.Length, Checksum = c.Location.Checksum,
                    })]);
                    var hits = LateInteractionSearch.Search(live.Source, queries[i], new SearchOptions { Top = 10, Candidates = rerank }, CancellationToken.None).Hits;
                    latency.Add(watch.Elapsed.TotalMilliseconds);
                    agree += truths[i].Overlap(hits);
                    tied += truths[i].AtLeastTenth(hits);
                }

                var sorted = latency.Order().ToList();
                var source = fromGraph is { } n ? $"graph {n}" : "all";
                var exact = rerank == fromGraph ? "all of them (no sign codes)" : rerank.ToString(System.Globalization.CultureInfo.InvariantCulture);
                context.Report(
                    $"{name}: candidates {source}, re-rank {exact}: top-10 agreement (strict / counting ties / p50 ms / p95 ms)",
                    agree / queries.Length,
                    string.Create(System.Globalization.CultureInfo.InvariantCulture, $"{tied / queries.Length:0.000} / {SearchBenchmark.Percentile(sorted, 0.50):0.0} / {SearchBenchmark.Percentile(sorted, 0.95):0.0}"));
            }
        }
    }

    /// <summary>
    /// Catalog bytes a page costs, words in the page record (schema 1) against their location only (schema 2),
    /// on the same sample of pages in two catalogs of their own (page records alone), beside the whole catalog
    /// of this index and the page-word store's bytes.
    /// </summary>
    private static void CatalogBytes(BenchmarkContext context, string name, string directory, int pages, List<(PageKey Key, PageWord[] Words, WordsAtRecord At)> sample)
    {
        context.Report($"{name}: catalog bytes per page (page records with the words' location, vector-set records)", (double)FileSizes(directory, "catalog*.db") / pages, "B");
        context.Report($"{name}: page-word store bytes per page", (double)FileSizes(Path.Combine(directory, "words"), "*") / pages, "B");
        var inline = PageRecordBytes(Path.Combine(directory, "pages-inline"), sample.Select(p => new PageRecord
        {
            Id = p.Key.Hex, References = 1, Width = 612, Height = 792,
            Words = [.. p.Words.Select(w => new WordRecord { T = w.Text, L = w.Box.Left, B = w.Box.Bottom, R = w.Box.Right, U = w.Box.Top })],
        }));
        var located = PageRecordBytes(Path.Combine(directory, "pages-located"), sample.Select(p => new PageRecord { Id = p.Key.Hex, References = 1, Width = 612, Height = 792, WordsAt = p.At }));
        context.Report($"{name}: catalog bytes per page record, words inside (schema 1) / their location (schema 2), {sample.Count} pages", inline / sample.Count, $"{located / sample.Count:0}");
        context.Report($"{name}: catalog bytes per page with words inside, derived (this catalog + the difference above)", ((double)FileSizes(directory, "catalog*.db") / pages) + ((inline - located) / sample.Count), "B");
    }

    private static double PageRecordBytes(string directory, IEnumerable<PageRecord> records)
    {
        using (var held = IndexLock.Acquire(directory, "serving benchmark, page records"))
        using (var catalog = IndexCatalog.Open(held))
        {
            foreach (var chunk in records.Chunk(BatchPages))
            {
                var edit = new CatalogEdit();
                edit.AddPages.AddRange(chunk);
                catalog.Apply(edit);
            }
        }

        return FileSizes(directory, "catalog*.db");
    }

    /// <summary>
    /// A search in a new process as the CLI makes it: before, a new store checks every record and the catalog's
    /// live list is read; now the view file is read and its graph mapped, and only the candidates are checked.
    /// </summary>
    private static void FirstSearch(BenchmarkContext context, string name, IndexCatalog catalog, string directory, string encoderId, VectorSet query)
    {
        var before = new List<double>();
        var now = new List<double>();
        var nowAll = new List<double>();
        for (var i = 0; i < 3; i++)
        {
            var watch = Stopwatch.StartNew();
            using (var cold = VectorStore.OpenForReading(catalog, directory))
            using (var live = cold.OpenLive(encoderId))
            {
                LateInteractionSearch.Search(live.Source, query, new SearchOptions { Top = 10 }, CancellationToken.None);
            }

            before.Add(watch.Elapsed.TotalMilliseconds);
            foreach (var fromGraph in new[] { true, false })
            {
                watch.Restart();
                using (var cold = VectorStore.OpenForReading(catalog, directory))
                using (var views = new ServingViews(catalog, () => cold, directory, readOnly: true))
                {
                    views.Search(encoderId, query, 10, fromGraph, CancellationToken.None);
                    if (views.Builds != 0)
                    {
                        throw new InvalidOperationException("the view file was not used");
                    }
                }

                (fromGraph ? now : nowAll).Add(watch.Elapsed.TotalMilliseconds);
            }
        }

        context.Report($"{name}: first search in a new process, before (median of 3)", Median(before), "ms");
        context.Report($"{name}: first search in a new process, serving view file, candidates graph (median of 3)", Median(now), "ms");
        context.Report($"{name}: first search in a new process, serving view file, candidates all (median of 3)", Median(nowAll), "ms");
    }

    /// <summary>Keeping the view current: commits of new and removed pages, applied as changes, against a full build.</summary>
    private static void Churn(BenchmarkContext context, string name, IndexCatalog catalog, VectorStore store, ServingViews views, EncoderIdentity identity, TermCorpus corpus, int pages)
    {
        var rounds = 5;
        var applied = new List<double>();
        for (var round = 0; round < rounds; round++)
        {
            var batch = Enumerable.Range(pages + (round * 100), 100).Select(i => (Key: KeyOf(i), Vectors: corpus.Page(i))).ToList();
            AddPages(catalog, batch.Select(b => b.Key));
            store.AppendAndCommit(identity, batch);
            var edit = new CatalogEdit();
            edit.SetReferences.AddRange(Enumerable.Range(round * 100, 100).Select(i => (KeyOf(i).Hex, 0)));
            catalog.Apply(edit);
            catalog.RemoveUnreferencedPages();
            var watch = Stopwatch.StartNew();
            views.For(identity.Id, CancellationToken.None);
            applied.Add(watch.Elapsed.TotalMilliseconds);
        }

        context.Report($"{name}: serving view brought up to date after a commit of 100 new and 100 removed pages (median)", Median(applied), "ms");
        if (views.Builds != 1)
        {
            throw new InvalidOperationException("the view was rebuilt instead of moved forward");
        }
    }

    /// <summary>
    /// The exhaustive top-10 of a query. Pages of equal score are equally right answers; which of them the
    /// exhaustive search lists is decided by page-key order among all pages, so besides the strict set overlap a
    /// hit also counts as agreeing when its exact score reaches the 10th exhaustive score.
    /// </summary>
    private sealed record Truth(HashSet<string> Keys, float Tenth)
    {
        public double Overlap(IReadOnlyList<SearchHit> hits) => hits.Take(10).Count(h => Keys.Contains(h.Key.Hex)) / 10.0;

        public double AtLeastTenth(IReadOnlyList<SearchHit> hits) => hits.Take(10).Count(h => Keys.Contains(h.Key.Hex) || h.Score >= Tenth - 1e-5f) / 10.0;
    }

    private static void AddPages(IndexCatalog catalog, IEnumerable<PageKey> keys)
    {
        var edit = new CatalogEdit();
        edit.AddPages.AddRange(keys.Select(k => new PageRecord { Id = k.Hex, References = 1 }));
        catalog.Apply(edit);
    }

    /// <summary>New pages as a scan adds them: words to the page-word store first (durable), then the records naming them.</summary>
    internal static List<PageRecord> AddPages(IndexCatalog catalog, PageWordStore words, List<(PageKey Key, PageWord[] Words)> pages)
    {
        var at = words.Append([.. pages.Select(p => (p.Key, (IReadOnlyList<PageWord>)p.Words))]);
        var records = pages.Select((p, i) => new PageRecord
        {
            Id = p.Key.Hex, References = 1, Width = 612, Height = 792,
            WordsAt = new WordsAtRecord { File = at[i].File, Offset = at[i].Offset, Length = at[i].Length, Checksum = at[i].Checksum },
        }).ToList();
        var edit = new CatalogEdit();
        edit.AddPages.AddRange(records);
        catalog.Apply(edit);
        return records;
    }

    internal static PageKey KeyOf(int i) => PageKey.Of(BitConverter.GetBytes(i));

    private static void Latency(BenchmarkContext context, string what, List<double> milliseconds)
    {
        var sorted = milliseconds.Order().ToList();
        context.Report($"{what}, p50", SearchBenchmark.Percentile(sorted, 0.50), "ms");
        context.Report($"{what}, p95", SearchBenchmark.Percentile(sorted, 0.95), "ms");
    }

    private static double Median(List<double> values) => SearchBenchmark.Percentile([.. values.Order()], 0.50);

    private static long Resident()
    {
        GC.Collect();
        GC.WaitForPendingFinalizers();
        using var self = Process.GetCurrentProcess();
        return self.WorkingSet64;
    }

    private static long FileSizes(string folder, string pattern) => Directory.EnumerateFiles(folder, pattern).Sum(f => new FileInfo(f).Length);
}
