using System.Diagnostics;
using System.Runtime.InteropServices;
using IndexKeeper.Churn.Report;
using IndexKeeper.Core.Index;
using IndexKeeper.Core.Pipeline;
using IndexKeeper.Demo;
using IndexKeeper.Service.Application;
using IndexKeeper.Service.Querying;

namespace IndexKeeper.Churn.Strategies;

/// <summary>
/// Builds a fresh index over the final store and compares it with the incrementally kept one: the same
/// page keys, the same page keys per document, byte-identical vector sets per page key (read back through
/// the vector store's segment source), and the same top-10 for a set of queries.
/// </summary>
internal static class RebuildComparer
{
    private const int MaxDifferencesListed = 20;

    public static RebuildComparison Compare(KeeperIndex incremental, KeeperIndex rebuild, int dimensions, int queryCount, int seed)
    {
        var stopwatch = Stopwatch.StartNew();
        var built = rebuild.Sync(dimensions, compact: true);
        var rebuildSeconds = stopwatch.Elapsed.TotalSeconds;
        var differences = new List<string>();
        void Note(string difference)
        {
            if (differences.Count < MaxDifferencesListed)
            {
                differences.Add(difference);
            }
        }

        using var keptComposed = incremental.Open(dimensions, "churn comparison");
        using var freshComposed = rebuild.Open(dimensions, "churn comparison");
        var (kept, fresh) = (keptComposed.Index, freshComposed.Index);

        var keptKeys = kept.Catalog.Pages.All().Where(p => p.References > 0).Select(p => p.Id).ToHashSet(StringComparer.Ordinal);
        var freshKeys = fresh.Catalog.Pages.All().Where(p => p.References > 0).Select(p => p.Id).ToHashSet(StringComparer.Ordinal);
        var onlyInOne = keptKeys.Except(freshKeys).Concat(freshKeys.Except(keptKeys)).ToList();
        onlyInOne.Take(5).ToList().ForEach(k => Note($"page key {k[..12]} is in one index only"));

        var keptDocuments = kept.Catalog.Documents.OfRoot(KeeperIndex.RootName).ToDictionary(d => d.Path, d => d.PageKeys, StringComparer.Ordinal);
        var freshDocuments = fresh.Catalog.Documents.OfRoot(KeeperIndex.RootName).ToDictionary(d => d.Path, d => d.PageKeys, StringComparer.Ordinal);
        var documentsDiffering = 0L;
        foreach (var path in keptDocuments.Keys.Union(freshDocuments.Keys))
        {
            if (!keptDocuments.TryGetValue(path, out var a) || !freshDocuments.TryGetValue(path, out var b) || !a.SequenceEqual(b))
            {
                documentsDiffering++;
                Note($"document {path} differs");
            }
        }

        var (compared, vectorsDiffering) = CompareVectors(kept, fresh, Note);
        var queries = Queries(fresh, queryCount, seed);
        var queriesDiffering = 0;
        foreach (var query in queries)
        {
            var a = keptComposed.Get<SearchOperation>().Search(query, 10, CancellationToken.None).Hits.Select(Describe).ToList();
            var b = freshComposed.Get<SearchOperation>().Search(query, 10, CancellationToken.None).Hits.Select(Describe).ToList();
            if (!a.SequenceEqual(b))
            {
                queriesDiffering++;
                Note($"query \"{query}\": incremental [{string.Join(", ", a)}] rebuild [{string.Join(", ", b)}]");
            }
        }

        return new RebuildComparison(
            keptKeys.Count, freshKeys.Count, onlyInOne.Count, documentsDiffering, compared, vectorsDiffering, queries.Count, queriesDiffering, differences, rebuildSeconds, built.Summary.PagesEmbedded);
    }

    private static string Describe(SearchReportHit hit) =>
        $"{hit.PageKey[..12]} {hit.Path}#{hit.Page} {hit.Score.ToString("R", System.Globalization.CultureInfo.InvariantCulture)}";

    private static (long Compared, long Differing) CompareVectors(OpenIndex kept, OpenIndex fresh, Action<string> note)
    {
        var encoderId = kept.Encoder.Identity.Id;
        using var a = kept.Store.OpenLive(encoderId);
        using var b = fresh.Store.OpenLive(encoderId);
        var ordinalsA = Ordinals(a);
        var ordinalsB = Ordinals(b);
        long compared = 0, differing = 0;
        foreach (var key in ordinalsA.Keys.Union(ordinalsB.Keys))
        {
            if (!ordinalsA.TryGetValue(key, out var i) || !ordinalsB.TryGetValue(key, out var j))
            {
                differing++;
                note($"live vector set {key[..12]} is in one index only");
                continue;
            }

            compared++;
            var x = a.Source.Get(i);
            var y = b.Source.Get(j);
            var same = x.Dimensions == y.Dimensions
                && MemoryMarshal.AsBytes(x.Vectors).SequenceEqual(MemoryMarshal.AsBytes(y.Vectors))
                && x.SignCodes.SequenceEqual(y.SignCodes)
                && MemoryMarshal.AsBytes(x.Regions).SequenceEqual(MemoryMarshal.AsBytes(y.Regions));
            if (!same)
            {
                differing++;
                note($"vector set {key[..12]} differs");
            }
        }

        return (compared, differing);
    }

    private static Dictionary<string, int> Ordinals(LiveVectors live) =>
        live.Records.Select((r, i) => (r.PageKey, i)).ToDictionary(p => p.PageKey, p => p.i, StringComparer.Ordinal);

    /// <summary>Queries of two to four words taken from pages of the store, chosen by the seed.</summary>
    private static List<string> Queries(OpenIndex session, int count, int seed)
    {
        var pages = session.Catalog.Pages.All().Where(p => p.References > 0).OrderBy(p => p.Id, StringComparer.Ordinal)
            .Select(p => PageInput.WordsOf(p, session.Words)).Where(w => w.Count > 4).ToList();
        var random = DemoRandom.For(seed, "queries");
        var queries = new List<string>(count);
        while (queries.Count < count && pages.Count > 0)
        {
            var words = random.Pick(pages);
            var start = random.Next(words.Count - 4);
            queries.Add(string.Join(' ', words.Skip(start).Take(random.Next(2, 5)).Select(w => w.Text)));
        }

        return queries;
    }
}
