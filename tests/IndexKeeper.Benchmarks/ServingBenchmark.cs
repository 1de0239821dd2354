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
    private const string CacheComplete = "cache-complete";

    // Pages whose records are written again in two side catalogs to compare the two places of words.
    private const int WordSample = 5_000;

    public string Name => "serving";

    public void Run(BenchmarkContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        // IK_SERVING_SIZES (comma-separated page counts) runs other sizes, e.g. one size at a time on a loaded machine.
        var sizes = Environment.GetEnvironmentVariable("IK_SERVING_SIZES") is { Length: > 0 } chosen
            ? chosen.Split(',').Select(p => int.Parse(p, System.Globalization.CultureInfo.InvariantCulture)).ToArray()
            : context.Quick ? [600, 2_400] : [10_000, 100_000];
        foreach (var pages in sizes)
        {
            Size(context, pages);
        }
    }

    private static void Size(BenchmarkContext context, int pages)
    {
        var directory = Path.Combine(context.WorkDirectory, pages.ToString(System.Globalization.CultureInfo.InvariantCulture));
        var corpus = new TermCorpus(seed: pages, MinWords, MaxWords, QueryWords);
        var identity = corpus.Identity;
        var name = $"{pages / 1000}k";

        // IK_SERVING_CACHE names a folder that keeps the freshly written index of each size between runs (it is
        // copied in, so the run's own changes never reach it): the 100k index takes long to write.
        var cache = Environment.GetEnvironmentVariable("IK_SERVING_CACHE") is { Length: > 0 } cacheRoot ? Path.Combine(cacheRoot, Path.GetFileName(directory)) : null;
        var reused = cache is not null && File.Exists(Path.Combine(cache, CacheComplete));
        if (reused)
        {
            var (copy, _) = Measure.Once(() => CopyFolder(cache!, directory));
            context.Note($"{name}: index copied from the cache {cache} in {copy:0.0} s (written by an earlier run of the same generator)");
            corpus.Replay(pages);
        }

        Directory.CreateDirectory(directory);
        if (!reused)
        {
            using (var held = IndexLock.Acquire(directory, "serving benchmark"))
            using (var catalog = IndexCatalog.Open(held))
            using (var store = VectorStore.Open(catalog, directory))
            {
                Fill(context, name, directory, catalog, store, corpus, pages);
            }

            if (cache is not null)
            {
                // The index as written and closed, before this run's changes (they reach the work copy only).
                CopyFolder(directory, cache);
                File.WriteAllText(Path.Combine(cache, CacheComplete), "written by the serving benchmark\n");
            }
        }

        using (var held = IndexLock.Acquire(directory, "serving benchmark"))
        using (var catalog = IndexCatalog.Open(held))
        using (var store = VectorStore.Open(catalog, directory))
        {
            var vectors = catalog.VectorSets.VectorCounts(identity.Id).Vectors;
            context.Note($"{name}: {pages} pages, {vectors} vectors ({(double)vectors / pages:0.0} a page), queries of {QueryWords} words; load at start {Measure.LoadAverage():0.0}");
            context.Report($"{name}: segment bytes per page", (double)FileSizes(Path.Combine(directory, VectorStore.SegmentsFolder), "*") / pages, "B");
            Serve(context, name, directory, catalog, store, corpus, pages);
        }
    }

    private static void Fill(BenchmarkContext context, string name, string directory, IndexCatalog catalog, VectorStore store, TermCorpus corpus, int pages)
    {
        using var wordStore = PageWordStore.OpenForWriting(directory);
        var sample = new List<(PageKey Key, PageWord[] Words, WordsAtRecord At)>();
        var (fill, _) = Measure.Once(() =>
        {
            for (var at = 0; at < pages; at += BatchPages)
            {
                var batch = Enumerable.Range(at, Math.Min(BatchPages, pages - at)).Select(i => (Key: KeyOf(i), Made: corpus.PageAndWords(i))).ToList();
                var records = AddPages(catalog, wordStore, [.. batch.Select(b => (b.Key, b.Made.Words))]);
                sample.AddRange(batch.Zip(records).Take(Math.Max(0, WordSample - sample.Count)).Select(p => (p.First.Key, p.First.Made.Words, p.Second.WordsAt!)));
                store.AppendAndCommit(corpus.Identity, [.. batch.Select(b => (b.Key, b.Made.Vectors))]);
            }

            store.SealAll();
        });
        context.Note($"{name}: index written in {fill:0.0} s");
        CatalogBytes(context, name, directory, pages, sample);
    }

    /// <summary>The serving view of centroid lists built, searched against exhaustive MaxSim and <c>all</c>, reopened cold and kept current.</summary>
    private static void Serve(BenchmarkContext context, string name, string directory, IndexCatalog catalog, VectorStore store, TermCorpus corpus, int pages)
    {
        var identity = corpus.Identity;

        // The serving view, built from the whole catalog once (a writer that finds no file does this).
        var memoryBefore = Resident();
        var managedBefore = GC.GetTotalMemory(forceFullCollection: true);
        using var views = new ServingViews(catalog, () => store, directory, readOnly: false, CandidateSource.Centroids);
        var (build, buildCpu) = Measure.Once(() => views.For(identity.Id, CancellationToken.None));
        var resident = Resident() - memoryBefore;
        var managed = GC.GetTotalMemory(forceFullCollection: true) - managedBefore;
        var view = views.For(identity.Id, CancellationToken.None);
        context.Report($"{name}: centroid view build from the catalog ({view.CentroidCount} centroids trained and every vector assigned), wall", build, "s");
        context.Report($"{name}: centroid view build, CPU", buildCpu, "s");
        context.Report($"{name}: working set growth per page over the build (includes segment pages mapped while reading)", (double)resident / pages, "B");
        context.Report($"{name}: serving view managed heap per page (directory + centroid lists)", (double)managed / pages, "B");
        context.Report($"{name}: centroid lists per page, estimated (centroids, codes, list entries)", (double)view.CentroidBytesEstimate / pages, "B");
        var (persist, _) = Measure.Once(() => views.Persist(CancellationToken.None));
        context.Report($"{name}: serving view written to disk, wall", persist, "s");
        context.Report($"{name}: serving view file per page (directory + centroid lists)", (double)FileSizes(Path.Combine(directory, ServingViewFile.Folder), "*") / pages, "B");

        // `all` as a daemon of that source holds it: built from the segments, each page keeping its distinct sign codes
        // (the file of `centroids` would serve `all` too, with every vector's code). Built in memory with that file set
        // aside, then put back for the runs below that read it.
        var servingFolder = Path.Combine(directory, ServingViewFile.Folder);
        Directory.Move(servingFolder, servingFolder + ".aside");
        using var allViews = new ServingViews(catalog, () => store, directory, readOnly: true, CandidateSource.All);
        ServingView allView;
        var allBuild = Stopwatch.StartNew();
        try
        {
            allView = allViews.For(identity.Id, CancellationToken.None);
            context.Report($"{name}: view of all built from the segments, wall", allBuild.Elapsed.TotalSeconds, "s");
        }
        finally
        {
            Directory.Move(servingFolder + ".aside", servingFolder);
        }

        if (allViews.Builds != 1)
        {
            throw new InvalidOperationException("the view of `all` was not built from the segments");
        }

        context.Report($"{name}: page codes of the view of all per page, estimated", (double)allView.PageCodeBytesEstimate / pages, "B");

        var queryCount = context.Quick ? 6 : 30;
        var queries = Enumerable.Range(0, queryCount).Select(i => corpus.Query(i * (pages / queryCount / 97) * 97)).ToArray();
        var exhaustive = new List<double>();
        var all = new List<double>();
        var allFromSegments = new List<double>();
        var centroids = new List<double>();
        var truths = new List<Truth>();
        var served = new List<IReadOnlyList<SearchHit>>();
        double agreeAll = 0, agreeCentroids = 0, tiedCentroids = 0;

        // The reference and the old path read through stores of their own: the product lets go of its store's mapped
        // pages as its searches add up, which must not make the others map the whole store again.
        using var exhaustiveStore = VectorStore.OpenForReading(catalog, directory);
        using var segmentStore = VectorStore.OpenForReading(catalog, directory);
        foreach (var query in queries)
        {
            var watch = Stopwatch.StartNew();
            using (var live = exhaustiveStore.OpenLive(identity.Id))
            {
                var truth = LateInteractionSearch.Search(live.Source, query, new SearchOptions { Top = 10, Candidates = int.MaxValue }, CancellationToken.None);
                exhaustive.Add(watch.Elapsed.TotalMilliseconds);
                truths.Add(new Truth([.. truth.Hits.Select(h => h.Key.Hex)], truth.Hits.Count < 10 ? float.NegativeInfinity : truth.Hits[9].Score));
            }

            // `all` as before version 5 of the view: every page's sign codes read from the mapped segments.
            watch.Restart();
            var segmentHits = Ranked(segmentStore, identity.Id, view.Entries(), query, CandidateCounts.Reranked(10, pages));
            allFromSegments.Add(watch.Elapsed.TotalMilliseconds);

            // `all`: every page's sign codes held by the view, then the float re-rank of the best.
            watch.Restart();
            var allHits = allViews.Search(identity.Id, query, 10, CancellationToken.None).Result.Hits;
            all.Add(watch.Elapsed.TotalMilliseconds);
            agreeAll += truths[^1].Overlap(allHits);
            if (!allHits.Select(h => h.Key).SequenceEqual(segmentHits.Select(h => h.Key)))
            {
                context.Note($"{name}: `all` from the view's page codes and from the segments differ on a query (ties at the cut)");
            }

            watch.Restart();
            var found = views.Search(identity.Id, query, 10, CancellationToken.None).Result.Hits;
            centroids.Add(watch.Elapsed.TotalMilliseconds);
            agreeCentroids += truths[^1].Overlap(found);
            served.Add(found);
            tiedCentroids += truths[^1].AtLeastTenth(found);
        }

        Latency(context, $"{name}: exhaustive float16 MaxSim", exhaustive);
        Latency(context, $"{name}: `all` before view version 5 (every page's sign codes from the mapped segments, re-rank of {CandidateCounts.Reranked(10, pages)})", allFromSegments);
        Latency(context, $"{name}: serving view, candidates all (every page's sign codes held by the view, re-rank of {CandidateCounts.Reranked(10, pages)})", all);
        Latency(context, $"{name}: serving view, candidates centroids ({CandidateCounts.FromCentroids(10, pages)} of {CandidateCounts.Probes} probes a token to the sign codes, re-rank of {CandidateCounts.RerankedAfterCentroids(10, pages)})", centroids);
        context.Report($"{name}: speedup over exhaustive, p50, candidates centroids / all", Median(exhaustive) / Median(centroids), $"{Median(exhaustive) / Median(all):0.00}");
        context.Report($"{name}: speedup of all, p50, page codes held by the view over codes from the segments", Median(allFromSegments) / Median(all), "x");
        context.Report($"{name}: top-10 agreement with exhaustive, candidates all", agreeAll / queries.Length, "share");
        context.Report($"{name}: top-10 agreement with exhaustive, candidates centroids", agreeCentroids / queries.Length, "share");
        context.Report($"{name}: top-10 agreement counting ties at the 10th score, candidates centroids", tiedCentroids / queries.Length, "share");
        Profile(context, name, view, store, identity.Id, queries, truths, pages);
        Losses(context, name, view, store, identity.Id, queries, truths, served, pages);
        // IK_SERVING_SWEEP=0 leaves out the grid of other settings (it builds two more views at 10k), e.g. while iterating.
        if (Environment.GetEnvironmentVariable("IK_SERVING_SWEEP") != "0")
        {
            Agreement(context, name, view, catalog, store, identity.Id, queries, truths, pages);
        }

        FirstSearch(context, name, catalog, directory, identity.Id, queries[0]);
        Churn(context, name, catalog, store, views, identity, corpus, pages);
    }

    /// <summary>
    /// Top-10 agreement and latency of the centroid lists at other settings: centroids trained × centroids probed
    /// per query token × most pages handed on × pages the sign-code stage hands to the float re-rank. The
    /// product's counts (<see cref="CandidateCounts"/>, <see cref="CentroidLists.CentroidsFor"/>) are chosen from these rows.
    /// </summary>
    private static void Agreement(BenchmarkContext context, string name, ServingView product, IndexCatalog catalog, VectorStore store, string encoderId, VectorSet[] queries, List<Truth> truths, int pages)
    {
        // Other centroid counts are built only where a build is affordable in one run (10k).
        var counts = pages <= 20_000 ? new[] { product.CentroidCount / 2, product.CentroidCount, product.CentroidCount * 2 } : [product.CentroidCount];
        foreach (var centroidCount in counts.Where(c => c <= CentroidLists.MaximumCentroids))
        {
            using var other = centroidCount == product.CentroidCount ? null : Built(catalog, store, encoderId, centroidCount, context, name);
            var view = other ?? product;
            foreach (var (probes, handed) in new[] { 1, 2 }.SelectMany(p => new[] { 3000, 10_000, 20_000, 33_000, 50_000 }.Where(h => h < pages).Select(h => (p, h))))
            {
                foreach (var rerank in new[] { 100, 1000 })
                {
                    double agree = 0;
                    var latency = new List<double>();
                    for (var i = 0; i < queries.Length; i++)
                    {
                        var watch = Stopwatch.StartNew();
                        var candidates = view.Candidates(queries[i], rerank, handed, probes);
                        var hits = Ranked(store, encoderId, candidates, queries[i], rerank);
                        latency.Add(watch.Elapsed.TotalMilliseconds);
                        agree += truths[i].Overlap(hits);
                    }

                    var sorted = latency.Order().ToList();
                    context.Report(
                        $"{name}: {centroidCount} centroids, {probes} probes, {handed} handed on to the sign codes, re-rank {rerank}: top-10 agreement (p50 ms / p95 ms)",
                        agree / queries.Length,
                        string.Create(System.Globalization.CultureInfo.InvariantCulture, $"{SearchBenchmark.Percentile(sorted, 0.50):0.0} / {SearchBenchmark.Percentile(sorted, 0.95):0.0}"));
                }
            }
        }
    }

    /// <summary>
    /// Where a served centroid query's time goes, stage by stage as <see cref="ServingViews.Search"/> runs them: the
    /// candidates (the lists and the page codes of the pages handed on, or every page's codes when the lists would
    /// cost more), opening the candidates' records, and the float16 re-rank; beside them the probed lists read
    /// alone (every page they reach ranked). Medians over the queries.
    /// </summary>
    private static void Profile(BenchmarkContext context, string name, ServingView view, VectorStore store, string encoderId, VectorSet[] queries, List<Truth> truths, int pages)
    {
        var handedOn = CandidateCounts.FromCentroids(10, pages);
        var reranked = CandidateCounts.RerankedAfterCentroids(10, pages);
        const int FewerReranked = 300;
        List<double> lists = [], both = [], open = [], rerank = [], every = [], listsForced = [], fewer = [], probedShare = [];
        double agreeEvery = 0, agreeListsForced = 0, agreeFewer = 0;
        for (var i = 0; i < queries.Length; i++)
        {
            var query = queries[i];
            probedShare.Add(view.ProbedShare(query));
            var watch = Stopwatch.StartNew();
            view.ListRanked(query, CandidateCounts.Probes);
            lists.Add(watch.Elapsed.TotalMilliseconds);
            watch.Restart();
            var candidates = view.Candidates(query, reranked, handedOn);
            both.Add(watch.Elapsed.TotalMilliseconds);
            watch.Restart();
            using var live = store.OpenSelected(encoderId, [.. candidates.Select(c => Record(encoderId, c))]);
            open.Add(watch.Elapsed.TotalMilliseconds);
            watch.Restart();
            LateInteractionSearch.Search(live.Source, query, new SearchOptions { Top = 10, Candidates = reranked }, CancellationToken.None);
            rerank.Add(watch.Elapsed.TotalMilliseconds);

            // Every page handed on: the lists are not read, every page's codes are (the other side of the rule).
            watch.Restart();
            var fromEvery = view.Candidates(query, reranked, pages);
            every.Add(watch.Elapsed.TotalMilliseconds);
            agreeEvery += truths[i].Overlap(Ranked(store, encoderId, fromEvery, query, reranked));

            // The lists read whatever they cost (the rule's other side at this size).
            watch.Restart();
            var fromLists = view.Candidates(query, reranked, handedOn, CandidateCounts.Probes, listEntryCost: 0);
            listsForced.Add(watch.Elapsed.TotalMilliseconds);
            agreeListsForced += truths[i].Overlap(Ranked(store, encoderId, fromLists, query, reranked));

            // Fewer pages to the float re-rank: the sign-code stage and the re-rank together.
            watch.Restart();
            var fewerHits = Ranked(store, encoderId, view.Candidates(query, FewerReranked, handedOn), query, FewerReranked);
            fewer.Add(watch.Elapsed.TotalMilliseconds);
            agreeFewer += truths[i].Overlap(fewerHits);
        }

        context.Report(
            $"{name}: centroid query, median ms: the probed lists read alone / candidates ({handedOn} pages handed on, or every page) / opening {reranked} records / float16 re-rank",
            Median(lists),
            string.Create(System.Globalization.CultureInfo.InvariantCulture, $"{Median(both):0.0} / {Median(open):0.0} / {Median(rerank):0.0}; load {Measure.LoadAverage():0.0}"));
        context.Report(
            $"{name}: centroid query with every page's codes scored (no lists): candidates median ms (top-10 agreement with exhaustive)",
            Median(every),
            string.Create(System.Globalization.CultureInfo.InvariantCulture, $"ms ({agreeEvery / queries.Length:0.000})"));
        context.Report(
            $"{name}: centroid query with the lists always read ({handedOn} handed on): candidates median ms (top-10 agreement with exhaustive)",
            Median(listsForced),
            string.Create(System.Globalization.CultureInfo.InvariantCulture, $"ms ({agreeListsForced / queries.Length:0.000})"));
        var shares = probedShare.Order().ToList();
        context.Report(
            $"{name}: share of the live vectors in the probed lists, p50 (min / max; the rule reads the lists below {0.75 / CentroidLists.ListEntryCost:0.0000} when a quarter of the pages is handed on)",
            Median(probedShare),
            string.Create(System.Globalization.CultureInfo.InvariantCulture, $"({shares[0]:0.0000} / {shares[^1]:0.0000})"));
        context.Report(
            $"{name}: centroid query re-ranking {FewerReranked} instead of {reranked}: candidates + re-rank median ms (top-10 agreement with exhaustive)",
            Median(fewer),
            string.Create(System.Globalization.CultureInfo.InvariantCulture, $"ms ({agreeFewer / queries.Length:0.000}); load {Measure.LoadAverage():0.0}"));
    }

    /// <summary>
    /// Where the exhaustive top-10 pages that the product's centroid search missed were lost: in no probed list,
    /// ranked by the lists past the pages handed on, ranked by the sign codes past the re-rank count, or in the
    /// re-rank itself (ties). Also how deep in the lists' ranking the last exhaustive top-10 page lies.
    /// </summary>
    private static void Losses(BenchmarkContext context, string name, ServingView view, VectorStore store, string encoderId, VectorSet[] queries, List<Truth> truths, List<IReadOnlyList<SearchHit>> served, int pages)
    {
        var handedOn = CandidateCounts.FromCentroids(10, pages);
        var reranked = CandidateCounts.RerankedAfterCentroids(10, pages);
        int unlisted = 0, pastHandOn = 0, pastSignCodes = 0, inRerank = 0;
        var deepest = new List<double>();
        var deepestTwoProbes = new List<double>();
        for (var i = 0; i < queries.Length; i++)
        {
            var listed = view.ListRanked(queries[i], CandidateCounts.Probes);
            var listRank = listed.Select((e, r) => (e.Key.Hex, r)).ToDictionary(p => p.Hex, p => p.r, StringComparer.Ordinal);
            var handed = listed.Take(handedOn).ToList();
            Dictionary<string, int> signRank;
            using (var live = store.OpenSelected(encoderId, [.. handed.Select(c => Record(encoderId, c))]))
            {
                var ranked = LateInteractionSearch.FirstStage(live.Source, queries[i], handed.Count, Environment.ProcessorCount, CancellationToken.None);
                signRank = ranked.Select((s, r) => (live.Source.Get(s.Ordinal).Key.Hex, r)).ToDictionary(p => p.Hex, p => p.r, StringComparer.Ordinal);
            }

            var found = served[i].Select(h => h.Key.Hex).ToHashSet(StringComparer.Ordinal);
            foreach (var key in truths[i].Keys.Where(k => !found.Contains(k)))
            {
                if (!listRank.TryGetValue(key, out var rank))
                {
                    unlisted++;
                }
                else if (rank >= handedOn)
                {
                    pastHandOn++;
                }
                else if (signRank.GetValueOrDefault(key, int.MaxValue) >= reranked)
                {
                    pastSignCodes++;
                }
                else
                {
                    inRerank++;
                }
            }

            deepest.Add(truths[i].Keys.Max(k => listRank.GetValueOrDefault(k, pages)));
            var twoProbes = view.ListRanked(queries[i], 2).Select((e, r) => (e.Key.Hex, r)).ToDictionary(p => p.Hex, p => p.r, StringComparer.Ordinal);
            deepestTwoProbes.Add(truths[i].Keys.Max(k => twoProbes.GetValueOrDefault(k, pages)));
        }

        var total = queries.Length * 10.0;
        context.Report(
            $"{name}: exhaustive top-10 pages missed by centroids, share lost: in no probed list / past the {handedOn} handed on / past the {reranked} the sign codes keep / in the re-rank",
            (unlisted + pastHandOn + pastSignCodes + inRerank) / total,
            string.Create(System.Globalization.CultureInfo.InvariantCulture, $"{unlisted / total:0.000} / {pastHandOn / total:0.000} / {pastSignCodes / total:0.000} / {inRerank / total:0.000}"));
        foreach (var (probes, ranks) in new[] { (CandidateCounts.Probes, deepest), (2, deepestTwoProbes) })
        {
            var sorted = ranks.Order().ToList();
            context.Report(
                $"{name}: lists' rank of the deepest exhaustive top-10 page, {probes} probes a token, p50 (p90 / max)",
                SearchBenchmark.Percentile(sorted, 0.50),
                string.Create(System.Globalization.CultureInfo.InvariantCulture, $"{SearchBenchmark.Percentile(sorted, 0.90):0} / {sorted[^1]:0}"));
        }
    }

    /// <summary>A centroid view with <paramref name="centroidCount"/> centroids, built as <see cref="ServingViews"/> builds one.</summary>
    private static ServingView Built(IndexCatalog catalog, VectorStore store, string encoderId, int centroidCount, BenchmarkContext context, string name)
    {
        var live = catalog.VectorSets.Live(encoderId);
        var view = new ServingView(encoderId, catalog.VectorSetGeneration, CandidateSource.Centroids) { CentroidsWanted = centroidCount };
        var (wall, cpu) = Measure.Once(() =>
        {
            foreach (var chunk in ServingViews.BuildChunks(live))
            {
                view.Apply(view.Generation, [.. chunk.Select(r => new ServingChange(PageKey.Parse(r.PageKey), new RecordLocation(r.SegmentId, r.Offset, r.Length, unchecked((uint)r.Checksum)), r.VectorCount))], locations =>
                {
                    var opened = store.OpenSelected(encoderId, [.. locations.Select(l => new VectorSetRecord { EncoderId = encoderId, SegmentId = l.SegmentId, Offset = l.Offset, Length = l.Length, Checksum = l.Checksum })]);
                    return (opened.Source, Enumerable.Range(0, locations.Count).ToList());
                }, CancellationToken.None);
            }
        });
        context.Report($"{name}: centroid view of {centroidCount} centroids built, wall / CPU", wall, $"{cpu:0.0} s CPU");
        return view;
    }

    /// <summary>The two exact stages over the given pages, as <see cref="ServingViews.Search"/> runs them.</summary>
    private static IReadOnlyList<SearchHit> Ranked(VectorStore store, string encoderId, IReadOnlyList<ServingEntry> candidates, VectorSet query, int rerank)
    {
        using var live = store.OpenSelected(encoderId, [.. candidates.Select(c => Record(encoderId, c))]);
        return LateInteractionSearch.Search(live.Source, query, new SearchOptions { Top = 10, Candidates = rerank }, CancellationToken.None).Hits;
    }

    private static VectorSetRecord Record(string encoderId, ServingEntry entry) => new()
    {
        EncoderId = encoderId, PageKey = entry.Key.Hex, SegmentId = entry.Location.SegmentId, Offset = entry.Location.Offset, Length = entry.Location.Length, Checksum = entry.Location.Checksum,
    };

    private static void CopyFolder(string from, string to)
    {
        Directory.CreateDirectory(to);
        foreach (var file in Directory.EnumerateFiles(from))
        {
            File.Copy(file, Path.Combine(to, Path.GetFileName(file)), overwrite: true);
        }

        foreach (var folder in Directory.EnumerateDirectories(from))
        {
            CopyFolder(folder, Path.Combine(to, Path.GetFileName(folder)));
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
            foreach (var source in new[] { CandidateSource.Centroids, CandidateSource.All })
            {
                watch.Restart();
                using (var cold = VectorStore.OpenForReading(catalog, directory))
                using (var views = new ServingViews(catalog, () => cold, directory, readOnly: true, source))
                {
                    views.Search(encoderId, query, 10, CancellationToken.None);
                    if (views.Builds != 0)
                    {
                        throw new InvalidOperationException("the view file was not used");
                    }
                }

                (source == CandidateSource.Centroids ? now : nowAll).Add(watch.Elapsed.TotalMilliseconds);
            }
        }

        context.Report($"{name}: first search in a new process, before the serving view (median of 3)", Median(before), "ms");
        context.Report($"{name}: first search in a new process, serving view file, candidates centroids (median of 3)", Median(now), "ms");
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
