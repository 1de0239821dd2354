using System.Diagnostics;
using System.Globalization;
using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Compaction;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Index;
using IndexKeeper.Core.Search;
using IndexKeeper.Service.Application;

namespace IndexKeeper.Benchmarks;

/// <summary>
/// The centroid lists' recall through a month of churn without retraining (issue 13): a real catalog and segments
/// of generated hashed-term pages, a centroid view trained once, then 30 simulated days through the real commit
/// path — working days add 2 % new pages whose words drift towards an unseen vocabulary (up to half of their
/// words new on the last day) and delete 1 %, and every day ends with a compaction (vector sets move). The view
/// is moved forward by the heard commits and never retrained. Each day: the product's recall figure (16 sample
/// queries of drawn live pages); on checkpoint days also a fixed query set against exhaustive MaxSim, for the kept
/// view and for a view trained afresh on that day's pages (the same sample queries), so the month's effect is a
/// difference measured on the same queries.
/// </summary>
public sealed class ChurnRecallBenchmark : IBenchmark
{
    private const int MinWords = 60;
    private const int MaxWords = 200;
    private const int BatchPages = 500;
    private const int Days = 30;
    private const double AddShare = 0.02;
    private const double DeleteShare = 0.01;
    private const double LastDayNewWords = 0.5;
    private const int OldSampleQueries = 32;
    private const int NewSampleQueries = 32;
    private const int TextQueries = 30;

    // IK_CHURN_RECALL_CHECKPOINTS (comma-separated days) and IK_CHURN_RECALL_EVERY (days between recall figures)
    // thin the measurements for a large size: each figure costs 16 exhaustive searches, each checkpoint a full build.
    private static readonly int[] Checkpoints = Environment.GetEnvironmentVariable("IK_CHURN_RECALL_CHECKPOINTS") is { Length: > 0 } days
        ? [.. days.Split(',').Select(d => int.Parse(d, CultureInfo.InvariantCulture))]
        : [0, 10, 20, 30];

    private static readonly int Every = Environment.GetEnvironmentVariable("IK_CHURN_RECALL_EVERY") is { Length: > 0 } every
        ? int.Parse(every, CultureInfo.InvariantCulture)
        : 1;

    public string Name => "churn-recall";

    public void Run(BenchmarkContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        // IK_CHURN_RECALL_SIZES (comma-separated page counts) runs other sizes.
        var sizes = Environment.GetEnvironmentVariable("IK_CHURN_RECALL_SIZES") is { Length: > 0 } chosen
            ? chosen.Split(',').Select(p => int.Parse(p, CultureInfo.InvariantCulture)).ToArray()
            : context.Quick ? [1_200] : [10_000];
        foreach (var pages in sizes)
        {
            Size(context, pages);
        }
    }

    private static void Size(BenchmarkContext context, int pages)
    {
        var directory = Path.Combine(context.WorkDirectory, pages.ToString(CultureInfo.InvariantCulture));
        Directory.CreateDirectory(directory);
        var name = $"{pages / 1000.0:0.#}k";
        var corpus = new TermCorpus(seed: pages + 13, MinWords, MaxWords, queryWords: 3);
        var identity = corpus.Identity;
        var random = new Random(pages);

        using var held = IndexLock.Acquire(directory, "churn-recall benchmark");
        using var catalog = IndexCatalog.Open(held);
        using var store = VectorStore.Open(catalog, directory);

        var live = new List<int>();
        var (fill, _) = Measure.Once(() =>
        {
            Add(catalog, store, corpus, identity, Enumerable.Range(0, pages).ToList(), 0);
            store.SealAll();
        });
        live.AddRange(Enumerable.Range(0, pages));
        context.Note($"{name}: {pages} pages written in {fill:0.0} s; load {Measure.LoadAverage():0.0}");

        using var views = new ServingViews(catalog, () => store, directory, readOnly: false, CandidateSource.Centroids);
        var (build, buildCpu) = Measure.Once(() => views.For(identity.Id, CancellationToken.None));
        var trainedOn = pages;
        context.Report($"{name}: view built and trained ({views.For(identity.Id, CancellationToken.None).CentroidCount} centroids), wall", build, "s");
        context.Report($"{name}: view built and trained, CPU", buildCpu, "s");

        // The fixed queries: text queries of the first pages, and sample queries (4 stored vectors) of pages of day 0.
        var textQueries = Enumerable.Range(0, TextQueries).Select(i => i * 97).Where(i => i < pages).Select(corpus.Query).ToList();
        var oldSample = SampleQueries(catalog, store, identity.Id, RecallSample.Positions(pages, OldSampleQueries, seed: 7));
        var added = new List<int>();
        var next = pages;
        var addedTotal = 0;
        var daily = new List<(int Day, double Recall)>();
        for (var day = 0; day <= Days; day++)
        {
            var working = day > 0 && day % 7 is not (6 or 0);
            var moveWall = 0.0;
            if (working)
            {
                var newShare = LastDayNewWords * day / Days;
                var adds = Enumerable.Range(next, (int)(pages * AddShare)).ToList();
                next += adds.Count;
                Add(catalog, store, corpus, identity, adds, newShare);
                live.AddRange(adds);
                added.AddRange(adds);
                addedTotal += adds.Count;
                var removed = new List<int>();
                for (var i = 0; i < (int)(pages * DeleteShare); i++)
                {
                    var at = random.Next(live.Count);
                    removed.Add(live[at]);
                    live[at] = live[^1];
                    live.RemoveAt(live.Count - 1);
                }

                var edit = new CatalogEdit();
                edit.SetReferences.AddRange(removed.Select(i => (ServingBenchmark.KeyOf(i).Hex, 0)));
                catalog.Apply(edit);
                catalog.RemoveUnreferencedPages();
                added.RemoveAll(removed.ToHashSet().Contains);
            }

            if (day > 0)
            {
                store.SealAll();
                store.Compact(new CompactionOptions(), CancellationToken.None);
                var watch = Stopwatch.StartNew();
                views.For(identity.Id, CancellationToken.None);
                moveWall = watch.Elapsed.TotalMilliseconds;
            }

            if (day % Every != 0 && day != Days && !Checkpoints.Contains(day))
            {
                continue;
            }

            var recall = views.MeasureRecall(identity.Id, DateTimeOffset.UtcNow, CancellationToken.None);
            daily.Add((day, recall.Recall));
            var addedShare = (double)addedTotal / (trainedOn + addedTotal);
            context.Note(FormattableString.Invariant(
                $"{name} day {day,2}: {live.Count} live pages, {addedShare:P1} added since training, recall figure {recall.Recall:0.000} ({recall.Queries} queries), view moved in {moveWall:0} ms; load {Measure.LoadAverage():0.0}"));
            context.Report($"{name}: day {day:00} recall figure (16 sample queries)", recall.Recall, "share");

            if (Checkpoints.Contains(day))
            {
                Checkpoint(context, name, day, catalog, store, views, identity, textQueries, oldSample, SampleQueries(catalog, store, identity.Id, RecallSample.Positions(added.Count, NewSampleQueries, seed: day).Select(i => added[i])));
            }
        }

        if (views.Builds != 1)
        {
            throw new InvalidOperationException("the view was rebuilt (retrained) during the month instead of moved forward");
        }

        var first = daily.Where(d => d.Day <= 5).Average(d => d.Recall);
        var last = daily.Where(d => d.Day >= Days - 5).Average(d => d.Recall);
        context.Report($"{name}: recall figure, mean of days 0–5", first, "share");
        context.Report($"{name}: recall figure, mean of days 25–30", last, "share");
        context.Report($"{name}: recall figure, mean of days 25–30 minus days 0–5", last - first, "share");
    }

    /// <summary>
    /// The fixed query sets against exhaustive MaxSim for the kept view and for a view trained afresh on the same
    /// pages, and the product's recall figure of both on the same sample queries (the same generation seeds them).
    /// </summary>
    private static void Checkpoint(BenchmarkContext context, string name, int day, IndexCatalog catalog, VectorStore store, ServingViews kept, EncoderIdentity identity, List<VectorSet> text, List<VectorSet> oldSample, List<VectorSet> newSample)
    {
        var fresh = Path.Combine(context.WorkDirectory, $"fresh-{day}");
        Directory.CreateDirectory(Path.Combine(fresh, "serving"));
        using var retrained = new ServingViews(catalog, () => store, fresh, readOnly: true, CandidateSource.Centroids);
        var (build, _) = Measure.Once(() => retrained.For(identity.Id, CancellationToken.None));
        var keptFigure = kept.LastRecall(identity.Id, readFile: false)!.Recall;
        var freshFigure = retrained.MeasureRecall(identity.Id, DateTimeOffset.UtcNow, CancellationToken.None).Recall;
        context.Report($"{name}: day {day:00} recall figure, kept view / view trained afresh ({build:0.0} s build)", keptFigure - freshFigure, "difference");

        using var every = store.OpenLive(identity.Id);
        foreach (var (set, queries) in new[] { ("text queries", text), ("sample queries of day-0 pages", oldSample), ("sample queries of pages added since", newSample) })
        {
            if (queries.Count == 0)
            {
                continue;
            }

            double keptAgreement = 0;
            double freshAgreement = 0;
            foreach (var query in queries)
            {
                var exhaustive = LateInteractionSearch.Search(every.Source, query, new SearchOptions { Top = 10, Candidates = int.MaxValue }, CancellationToken.None).Hits;
                keptAgreement += Agreement(exhaustive, kept.Search(identity.Id, query, 10, CancellationToken.None).Result.Hits);
                freshAgreement += Agreement(exhaustive, retrained.Search(identity.Id, query, 10, CancellationToken.None).Result.Hits);
            }

            context.Report($"{name}: day {day:00} top-10 agreement with exhaustive, {set} ({queries.Count}), kept view", keptAgreement / queries.Count, "share");
            context.Report($"{name}: day {day:00} top-10 agreement with exhaustive, {set} ({queries.Count}), view trained afresh", freshAgreement / queries.Count, "share");
        }

        context.Note($"{name} day {day}: checkpoint done; load {Measure.LoadAverage():0.0}");
    }

    /// <summary>Share of the exhaustive top-10 served; a hit whose exact score reaches the 10th counts too (ties are equally right).</summary>
    private static double Agreement(IReadOnlyList<SearchHit> exhaustive, IReadOnlyList<SearchHit> served)
    {
        if (exhaustive.Count == 0)
        {
            return 1;
        }

        var truth = exhaustive.Select(h => h.Key).ToHashSet();
        var tenth = exhaustive.Count < 10 ? float.NegativeInfinity : exhaustive[^1].Score;
        return (double)served.Take(10).Count(h => truth.Contains(h.Key) || h.Score >= tenth - 1e-5f) / truth.Count;
    }

    /// <summary>Queries as the recall figure makes them (<see cref="RecallSample.Query"/>) from the stored vectors of <paramref name="pages"/>.</summary>
    private static List<VectorSet> SampleQueries(IndexCatalog catalog, VectorStore store, string encoderId, IEnumerable<int> pages)
    {
        var keys = pages.Select(i => ServingBenchmark.KeyOf(i).Hex).ToHashSet(StringComparer.Ordinal);
        using var drawn = store.OpenSelected(encoderId, [.. catalog.VectorSets.Live(encoderId).Where(r => keys.Contains(r.PageKey))]);
        return [.. Enumerable.Range(0, drawn.Source.Count).Select(i => RecallSample.Query(drawn.Source.Get(i)))];
    }

    private static void Add(IndexCatalog catalog, VectorStore store, TermCorpus corpus, EncoderIdentity identity, List<int> pages, double newShare)
    {
        foreach (var chunk in pages.Chunk(BatchPages))
        {
            var batch = chunk.Select(i => (Key: ServingBenchmark.KeyOf(i), Vectors: corpus.PageAndWords(i, newShare).Vectors)).ToList();
            var edit = new CatalogEdit();
            edit.AddPages.AddRange(batch.Select(b => new PageRecord { Id = b.Key.Hex, References = 1 }));
            catalog.Apply(edit);
            store.AppendAndCommit(identity, batch);
        }
    }
}
