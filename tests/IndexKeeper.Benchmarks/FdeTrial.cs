using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Index;
using IndexKeeper.Core.Search;

namespace IndexKeeper.Benchmarks;

public sealed class FdeTrial : IBenchmark
{
    public string Name => "fdetrial";

    public void Run(BenchmarkContext context)
    {
        var pages = 5000;
        var identity = new EncoderIdentity(new string('b', 64), "bench-topics", "generated", 128);
        var corpus = new TopicCorpus(seed: 7, 128, 40, 120, 12);
        using var held = IndexLock.Acquire(context.WorkDirectory, "trial");
        using var catalog = IndexCatalog.Open(held);
        using var store = VectorStore.Open(catalog, context.WorkDirectory);
        for (var at = 0; at < pages; at += 500)
        {
            var batch = Enumerable.Range(at, 500).Select(i => (Key: PageKey.Of(BitConverter.GetBytes(i)), Vectors: corpus.Page(out _))).ToList();
            var edit = new CatalogEdit();
            edit.AddPages.AddRange(batch.Select(k => new PageRecord { Id = k.Key.Hex, References = 1 }));
            catalog.Apply(edit);
            store.AppendAndCommit(identity, batch);
        }

        using var live = store.OpenLive(identity.Id);
        var queries = Enumerable.Range(0, 30).Select(i => corpus.Query(i * pages / 30)).ToArray();
        var truths = queries.Select(q => LateInteractionSearch.Search(live.Source, q, new SearchOptions { Top = 10, Candidates = int.MaxValue }, CancellationToken.None).Hits.Select(h => h.Ordinal).ToHashSet()).ToList();
        foreach (var (reps, bits, proj) in new[] { (5, 4, 16), (10, 4, 16), (5, 3, 32), (4, 5, 16), (10, 3, 16), (20, 3, 8), (3, 3, 64) })
        {
            var fde = new FixedDimensionalEncoding(128, reps, bits, proj);
            var encoded = new float[pages][];
            for (var p = 0; p < pages; p++)
            {
                encoded[p] = new float[fde.EncodedLength];
                fde.EncodePage(live.Source.Get(p).Vectors, encoded[p]);
            }

            double r200 = 0, r1000 = 0;
            for (var i = 0; i < queries.Length; i++)
            {
                var q = new float[fde.EncodedLength];
                fde.EncodeQuery(queries[i].Vectors, q);
                var order = Enumerable.Range(0, pages).OrderByDescending(p => System.Numerics.Tensors.TensorPrimitives.Dot(q, encoded[p])).ToList();
                r200 += order.Take(200).Count(truths[i].Contains) / 10.0;
                r1000 += order.Take(1000).Count(truths[i].Contains) / 10.0;
            }

            context.Report($"R={reps} bits={bits} proj={proj} dims={fde.EncodedLength}: recall of top-10 in 200 / 1000", r200 / queries.Length, $"{r1000 / queries.Length:0.000}");
        }

        double sign = 0;
        for (var i = 0; i < queries.Length; i++)
        {
            sign += LateInteractionSearch.FirstStage(live.Source, queries[i], 200, 2, CancellationToken.None).Count(c => truths[i].Contains(c.Ordinal)) / 10.0;
        }

        context.Report("sign codes of every page: recall of top-10 in 200", sign / queries.Length, "share");
    }
}
