using System.Diagnostics;
using System.Numerics.Tensors;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Search;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Benchmarks;

/// <summary>
/// Late-interaction search on generated pages of 1,030 vectors × 128-d and queries of 20 tokens: throughput
/// of the sign-code stage and of the float16 stage per core, top-10 latency, and bytes per page with the
/// top-10 each representation keeps against exhaustive float32 MaxSim.
/// </summary>
public sealed class SearchBenchmark : IBenchmark
{
    private const int Dimensions = 128;
    private const int VectorsPerPage = 1030;
    private const int QueryTokens = 20;
    private const int PoolFactor = 2;

    public string Name => "search";

    public void Run(BenchmarkContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        Throughput(context);
        Storage(context);
    }

    private static void Throughput(BenchmarkContext context)
    {
        var pages = context.Quick ? 400 : 10_240;
        var distinct = context.Quick ? 32 : 512;
        var generator = new TopicCorpus(seed: 1, Dimensions, VectorsPerPage, VectorsPerPage, QueryTokens);
        var bodies = new InMemoryVectorSetSource();
        for (var p = 0; p < distinct; p++)
        {
            bodies.Add(PageKey.Of(BitConverter.GetBytes(p)), generator.Page(out _));
        }

        var source = new CyclingSource(bodies, pages);
        context.Note($"{pages} pages of {VectorsPerPage} × {Dimensions}-d ({distinct} distinct bodies repeated, {distinct * (long)VectorsPerPage * Dimensions * 2 / 1_000_000} MB of float16), queries of {QueryTokens} tokens, {Environment.ProcessorCount} cores");
        var queries = Enumerable.Range(0, context.Quick ? 4 : 40).Select(i => generator.Query(i % distinct)).ToArray();
        var all = Enumerable.Range(0, pages).ToArray();

        // Per core = pages per second of CPU time the process used, so that other work on a shared machine
        // does not count against us; wall-clock figures are reported beside.
        LateInteractionSearch.FirstStage(source, queries[0], 100, 1, CancellationToken.None);
        Stage(context, "sign-code stage", pages, context.Quick ? 2 : 5, parallelism => LateInteractionSearch.FirstStage(source, queries[1], 100, parallelism, CancellationToken.None));
        Stage(context, "float16 stage", pages, context.Quick ? 1 : 2, parallelism => LateInteractionSearch.Rerank(source, queries[3], all, 10, parallelism, CancellationToken.None));

        var latencies = new List<double>();
        var options = new SearchOptions { Top = 10 };
        foreach (var query in queries)
        {
            var watch = Stopwatch.StartNew();
            LateInteractionSearch.Search(source, query, options, CancellationToken.None);
            latencies.Add(watch.Elapsed.TotalMilliseconds);
        }

        latencies.Sort();
        context.Report($"top-10 two-stage latency p50 ({queries.Length} queries, {options.EffectiveCandidates} candidates)", Percentile(latencies, 0.50), "ms");
        context.Report("top-10 two-stage latency p95", Percentile(latencies, 0.95), "ms");
    }

    private static void Storage(BenchmarkContext context)
    {
        var pages = context.Quick ? 24 : 1_000;
        var queryCount = context.Quick ? 4 : 30;
        var generator = new TopicCorpus(seed: 2, Dimensions, VectorsPerPage, VectorsPerPage, QueryTokens);
        var float32 = new VectorSet[pages];
        var float16 = new InMemoryVectorSetSource();
        var pooled = new InMemoryVectorSetSource();
        var targets = new int[pages];
        var poolWatch = new Stopwatch();
        var pooledVectors = 0L;
        for (var p = 0; p < pages; p++)
        {
            float32[p] = generator.Page(out targets[p]);
            var key = PageKey.Of(BitConverter.GetBytes(p));
            float16.Add(key, float32[p]);
            poolWatch.Start();
            var pooledPage = VectorPooling.Pool(float32[p], PoolFactor);
            poolWatch.Stop();
            pooledVectors += pooledPage.Count;
            pooled.Add(key, pooledPage);
        }

        context.Note($"agreement corpus: {pages} distinct pages, {queryCount} queries, top-10 against exhaustive float32 MaxSim");
        context.Report($"pooling (factor {PoolFactor}), time per page", poolWatch.Elapsed.TotalMilliseconds / pages, "ms");
        context.Report("bytes per page, float32 rows", VectorsPerPage * Dimensions * 4, "B");
        context.Report("bytes per page, float16 rows", VectorsPerPage * Dimensions * 2, "B");
        context.Report("bytes per page, sign codes", VectorsPerPage * Dimensions / 8, "B");
        context.Report($"bytes per page, pooled ×{PoolFactor} (float16 rows + sign codes)", (double)pooledVectors / pages * Dimensions * (2 + (1.0 / 8)), "B");
        context.Report("bytes per page, region boxes (4 × float32 per vector)", VectorsPerPage * 16, "B");

        var queries = Enumerable.Range(0, queryCount).Select(i => generator.Query(targets[i * pages / queryCount])).ToArray();
        var exhaustive = new SearchOptions { Top = 10, Candidates = int.MaxValue };
        var twoStage = new SearchOptions { Top = 10 };
        double f16 = 0, sign = 0, two = 0, pool = 0, poolTwo = 0;
        foreach (var query in queries)
        {
            var truth = Float32Top10(float32, query);
            f16 += Overlap(truth, LateInteractionSearch.Search(float16, query, exhaustive, CancellationToken.None).Hits.Select(h => h.Ordinal));
            sign += Overlap(truth, LateInteractionSearch.FirstStage(float16, query, 10, Environment.ProcessorCount, CancellationToken.None).Select(c => c.Ordinal));
            two += Overlap(truth, LateInteractionSearch.Search(float16, query, twoStage, CancellationToken.None).Hits.Select(h => h.Ordinal));
            pool += Overlap(truth, LateInteractionSearch.Search(pooled, query, exhaustive, CancellationToken.None).Hits.Select(h => h.Ordinal));
            poolTwo += Overlap(truth, LateInteractionSearch.Search(pooled, query, twoStage, CancellationToken.None).Hits.Select(h => h.Ordinal));
        }

        context.Report("top-10 kept vs float32: float16 exhaustive", f16 / queries.Length, "share");
        context.Report("top-10 kept vs float32: sign codes alone", sign / queries.Length, "share");
        context.Report($"top-10 kept vs float32: two-stage ({twoStage.EffectiveCandidates} candidates)", two / queries.Length, "share");
        context.Report($"top-10 kept vs float32: pooled ×{PoolFactor} float16 exhaustive", pool / queries.Length, "share");
        context.Report($"top-10 kept vs float32: pooled ×{PoolFactor} two-stage", poolTwo / queries.Length, "share");
    }

    private static HashSet<int> Float32Top10(VectorSet[] pages, VectorSet query)
    {
        var scores = new float[pages.Length];
        Parallel.For(0, pages.Length, p =>
        {
            var score = 0f;
            for (var q = 0; q < query.Count; q++)
            {
                var best = float.NegativeInfinity;
                for (var r = 0; r < pages[p].Count; r++)
                {
                    best = Math.Max(best, TensorPrimitives.Dot(query.Row(q), pages[p].Row(r)));
                }

                score += best;
            }

            scores[p] = score;
        });
        return [.. Enumerable.Range(0, pages.Length).OrderByDescending(p => scores[p]).ThenBy(p => p).Take(10)];
    }

    private static double Overlap(HashSet<int> truth, IEnumerable<int> found) => found.Take(10).Count(truth.Contains) / 10.0;

    private static void Stage(BenchmarkContext context, string name, int pages, int repeats, Action<int> run)
    {
        foreach (var parallelism in new[] { 1, Environment.ProcessorCount })
        {
            var process = Process.GetCurrentProcess();
            var cpuBefore = process.TotalProcessorTime;
            var watch = Stopwatch.StartNew();
            for (var i = 0; i < repeats; i++)
            {
                run(parallelism);
            }

            var wall = watch.Elapsed.TotalSeconds / repeats;
            process.Refresh();
            var cpu = (process.TotalProcessorTime - cpuBefore).TotalSeconds / repeats;
            var threads = parallelism == 1 ? "1 thread" : $"{parallelism} threads";
            context.Report($"{name}, {threads}: pages per CPU-second (per core)", pages / cpu, "pages/s");
            context.Report($"{name}, {threads}: pages per wall-clock second", pages / wall, "pages/s");
        }
    }

    internal static double Percentile(List<double> sorted, double share) =>
        sorted[Math.Min(sorted.Count - 1, (int)Math.Ceiling(share * sorted.Count) - 1)];

    /// <summary>Many ordinals over a few distinct bodies, so 10,000 pages fit in memory; every page is read in full.</summary>
    private sealed class CyclingSource(InMemoryVectorSetSource bodies, int count) : IVectorSetSource
    {
        public int Count => count;

        public StoredVectors Get(int ordinal) => bodies.Get(ordinal % bodies.Count);
    }
}
