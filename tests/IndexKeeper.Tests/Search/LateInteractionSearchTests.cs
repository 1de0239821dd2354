using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Search;
using Xunit.Abstractions;
using VectorSet = IndexKeeper.Core.Encoding.VectorSet;

namespace IndexKeeper.Tests.Search;

public sealed class LateInteractionSearchTests(ITestOutputHelper output)
{
    private static readonly Lazy<GeneratedCorpus> Corpus = new(() => new GeneratedCorpus(pages: 300, dimensions: 128, seed: 42));

    [Fact]
    public void Two_stage_search_returns_the_exhaustive_float32_top_10_on_at_least_95_percent_of_queries()
    {
        // Exhaustive float32 MaxSim by the definition (Khattab & Zaharia, ColBERT, SIGIR 2020) is the truth. With
        // the default options the first stage keeps 100 of 1,200 pages, so it has to do real work.
        var corpus = new GeneratedCorpus(pages: 1200, dimensions: 128, seed: 42, minVectors: 10, maxVectors: 30);
        var source = corpus.Source();
        var queries = Enumerable.Range(0, 100).Select(i => corpus.Query(targetPage: i * 11, tokens: 6)).ToArray();
        var truth = queries.AsParallel().AsOrdered().Select(query => corpus.Pages
                .Select((page, ordinal) => (Score: ReferenceMaxSim.FastScore(query.Vectors, page.Vectors, 128), Ordinal: ordinal))
                .OrderByDescending(e => e.Score).Take(10).Select(e => e.Ordinal).ToHashSet())
            .ToArray();
        var same = 0;
        var overlap = 0;
        for (var i = 0; i < queries.Length; i++)
        {
            var found = LateInteractionSearch.Search(source, queries[i], new SearchOptions(), CancellationToken.None).Hits.Select(h => h.Ordinal).ToHashSet();
            same += found.SetEquals(truth[i]) ? 1 : 0;
            overlap += found.Intersect(truth[i]).Count();
        }

        var share = (double)same / queries.Length;
        output.WriteLine($"two-stage top-10 equal to exhaustive float32 on {same}/{queries.Length} queries ({share:P1}); mean overlap {overlap / (double)queries.Length:F2}/10");
        Assert.True(share >= 0.95, $"only {share:P1} of queries agree");
    }

    [Fact]
    public void Exhaustive_mode_ranks_like_the_reference_on_float16_and_maps_every_token()
    {
        var corpus = Corpus.Value;
        var source = corpus.Source();
        var query = corpus.Query(targetPage: 17, tokens: 9);
        var result = LateInteractionSearch.Search(source, query, new SearchOptions { Top = 10, Candidates = int.MaxValue }, CancellationToken.None);

        // Reference on the float16 rounding of the pages (IEEE 754 binary16 through System.Half).
        var expected = corpus.Pages
            .Select((page, ordinal) => (Score: ReferenceMaxSim.Score(query.Vectors, ReferenceMaxSim.ThroughHalf(page.Vectors), 128), Ordinal: ordinal))
            .OrderByDescending(e => e.Score).Take(10).ToArray();
        Assert.Equal(300, result.CandidatesReranked);
        Assert.Equal(expected.Select(e => e.Ordinal), result.Hits.Select(h => h.Ordinal));
        foreach (var (hit, reference) in result.Hits.Zip(expected))
        {
            Assert.Equal(reference.Score, hit.Score, 1e-4);
            Assert.Equal(corpus.Keys[hit.Ordinal], hit.Key);
            var matches = ReferenceMaxSim.Matches(query.Vectors, ReferenceMaxSim.ThroughHalf(corpus.Pages[hit.Ordinal].Vectors), 128);
            Assert.Equal(9, hit.Matches.Count);
            for (var q = 0; q < 9; q++)
            {
                Assert.Equal(matches[q].Index, hit.Matches[q].VectorIndex);
                Assert.Equal(matches[q].Similarity, hit.Matches[q].Similarity, 1e-5);
                Assert.Equal(corpus.Pages[hit.Ordinal].Regions[matches[q].Index], hit.Matches[q].Region);
            }
        }
    }

    [Fact]
    public void One_thread_and_two_threads_give_the_same_hits()
    {
        var corpus = Corpus.Value;
        var source = corpus.Source();
        var query = corpus.Query(targetPage: 3, tokens: 6);
        var one = LateInteractionSearch.Search(source, query, new SearchOptions { Parallelism = 1, Candidates = 40 }, CancellationToken.None);
        var two = LateInteractionSearch.Search(source, query, new SearchOptions { Parallelism = 2, Candidates = 40 }, CancellationToken.None);
        Assert.Equal(one.Hits.Select(h => (h.Ordinal, h.Score)), two.Hits.Select(h => (h.Ordinal, h.Score)));
        Assert.Equal(40, one.CandidatesReranked);
        Assert.Equal(300, one.PagesScanned);
    }

    [Fact]
    public void Empty_queries_and_pages_without_vectors_find_nothing()
    {
        var source = new InMemoryVectorSetSource();
        source.Add(PageKey.Of("blank"u8), new VectorSet(128, [], []));
        var query = Corpus.Value.Query(targetPage: 0, tokens: 3);
        Assert.Empty(LateInteractionSearch.Search(source, query, new SearchOptions(), CancellationToken.None).Hits);
        Assert.Empty(LateInteractionSearch.Search(Corpus.Value.Source(), new VectorSet(128, [], []), new SearchOptions(), CancellationToken.None).Hits);
    }

    [Fact]
    public void Vector_sets_of_another_size_are_refused()
    {
        var source = new InMemoryVectorSetSource();
        source.Add(PageKey.Of("wide"u8), new GeneratedCorpus(pages: 1, dimensions: 256, seed: 1).Pages[0]);
        var query = Corpus.Value.Query(targetPage: 0, tokens: 3);
        var error = Assert.Throws<InvalidOperationException>(() => LateInteractionSearch.Search(source, query, new SearchOptions(), CancellationToken.None));
        Assert.Contains("256", error.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Search_stops_when_cancelled()
    {
        using var cancelled = new CancellationTokenSource();
        cancelled.Cancel();
        var query = Corpus.Value.Query(targetPage: 0, tokens: 3);
        Assert.ThrowsAny<OperationCanceledException>(() => LateInteractionSearch.Search(Corpus.Value.Source(), query, new SearchOptions { Candidates = 20 }, cancelled.Token));
    }

    [Fact]
    public void Options_reject_bad_values()
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => new SearchOptions { Top = 0 });
        Assert.Throws<ArgumentOutOfRangeException>(() => new SearchOptions { Candidates = -1 });
        Assert.Throws<ArgumentOutOfRangeException>(() => new SearchOptions { Parallelism = 0 });
        Assert.Equal(100, new SearchOptions { Top = 10 }.EffectiveCandidates);
        Assert.Equal(250, new SearchOptions { Top = 25 }.EffectiveCandidates);
    }

    [Fact]
    public void Top_scores_keep_the_best_with_ties_to_the_lower_ordinal()
    {
        var random = new Random(3);
        var offers = Enumerable.Range(0, 500).Select(i => (Score: (float)random.Next(50), Ordinal: i)).ToArray();
        var top = new TopScores(12);
        foreach (var (score, ordinal) in offers.Reverse())
        {
            top.Offer(score, ordinal);
        }

        var expected = offers.OrderByDescending(o => o.Score).ThenBy(o => o.Ordinal).Take(12);
        Assert.Equal(expected, top.ToSorted());
    }
}
