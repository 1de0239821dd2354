using System.Buffers.Binary;
using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Index;
using IndexKeeper.Core.Search;
using IndexKeeper.Core.Storage;
using IndexKeeper.Service.Application;
using IndexKeeper.Tests.Storage;

namespace IndexKeeper.Tests.Search;

/// <summary>
/// The serving view (docs/search.md, "Serving view"; docs/serving-view.md) against the catalog it serves: the
/// catalog's own live list is the reference for what the view must hold after each commit, and the search over
/// the view must give the hits of the search over every live vector set when the candidates cover the index.
/// </summary>
public sealed class ServingViewTests : IDisposable
{
    private const int Dimensions = 64;
    private static readonly EncoderIdentity Encoder = new(TestVectors.EncoderId, "test", "serving view test encoder", Dimensions);
    private readonly Support.TempDirectory directory = new();

    public void Dispose() => directory.Dispose();

    [Fact]
    public void The_generation_counts_commits_that_touch_vector_sets_and_only_those()
    {
        using var index = Index.Open(directory.Path);
        Assert.Equal(0, index.Catalog.VectorSetGeneration);
        var heard = new List<VectorSetChanges>();
        index.Catalog.VectorSetsCommitted += heard.Add;

        index.AddPages(0, 1, 2);
        Assert.Equal(0, index.Catalog.VectorSetGeneration);
        index.Embed(0, 1, 2);
        Assert.Equal(1, index.Catalog.VectorSetGeneration);

        index.Unreference(1);
        Assert.Equal(2, index.Catalog.VectorSetGeneration);
        Assert.Equal([1L, 2L], heard.Select(h => h.Generation));
        var gone = Assert.Single(heard[1].Changed);
        Assert.Equal(TestVectors.Key(1).Hex, gone.PageKey);
        Assert.False(gone.Live);
    }

    [Theory]
    [InlineData(CandidateSource.All)]
    [InlineData(CandidateSource.Graph)]
    [InlineData(CandidateSource.Centroids)]
    public void A_writer_moves_its_view_forward_by_each_commit_and_matches_the_catalog(CandidateSource source)
    {
        using var index = Index.Open(directory.Path);
        index.AddPages([.. Enumerable.Range(0, 30)]);
        index.Embed([.. Enumerable.Range(0, 30)]);
        using var views = index.Views(readOnly: false, source);
        AssertMatchesCatalog(index, views.For(Encoder.Id, CancellationToken.None));

        index.AddPages(30, 31);
        index.Embed(30, 31);
        index.Unreference(3, 4, 5);
        index.Store.SealAll();
        index.Store.Compact(new Core.Compaction.CompactionOptions { DeadShareThreshold = 0.01 }, CancellationToken.None);

        var view = views.For(Encoder.Id, CancellationToken.None);
        AssertMatchesCatalog(index, view);
        Assert.Equal(1, views.Builds);

        // The structure hands on live pages only, as many as asked for when it can reach every page (all probed).
        var query = TestVectors.Set(90, 4, Dimensions);
        var fewer = view.Candidates(query, view.Count - 1, handedOn: view.Count - 1, probes: 1000);
        Assert.Equal(view.Count - 1, fewer.Count);
        Assert.Subset(view.Entries().Select(e => e.Key).ToHashSet(), fewer.Select(e => e.Key).ToHashSet());
        if (source == CandidateSource.All)
        {
            // Its page codes, moved by the commits, rank as the sign codes the segments hold: the same best scores.
            var chosen = view.Candidates(query, 10, handedOn: 10);
            var scores = SegmentHammingScores(index, query);
            Assert.Equal(scores.Values.OrderDescending().Take(10), chosen.Select(e => scores[e.Key.Hex]).OrderDescending());

            // And as a view built afresh from the catalog: the same pages, ties at the cut included (page-key order).
            using var fresh = index.Views(readOnly: true, source);
            var rebuilt = fresh.For(Encoder.Id, CancellationToken.None);
            foreach (var seed in Enumerable.Range(300, 20))
            {
                var other = TestVectors.Set(seed, 2, Dimensions);
                Assert.Equal(rebuilt.Candidates(other, 7, handedOn: 7).Select(e => e.Key), view.Candidates(other, 7, handedOn: 7).Select(e => e.Key));
            }
        }
    }

    [Fact]
    public void A_read_only_open_uses_the_file_when_current_and_never_writes_it_when_stale()
    {
        using (var index = Index.Open(directory.Path))
        {
            index.AddPages(0, 1, 2, 3);
            index.Embed(0, 1, 2, 3);
            using var writer = index.Views(readOnly: false);
            writer.For(Encoder.Id, CancellationToken.None);
            writer.Persist(CancellationToken.None);
            using var reader = index.Views(readOnly: true);
            AssertMatchesCatalog(index, reader.For(Encoder.Id, CancellationToken.None));
            Assert.Equal(0, reader.Builds);

            index.Unreference(2);
        }

        var file = ServingViewFile.PathOf(directory.Path, Encoder.Id);
        var before = File.ReadAllBytes(file);
        var written = File.GetLastWriteTimeUtc(file);
        using (var index = Index.Open(directory.Path))
        using (var reader = index.Views(readOnly: true))
        {
            AssertMatchesCatalog(index, reader.For(Encoder.Id, CancellationToken.None));
            Assert.Equal(1, reader.Builds);
            reader.Persist(CancellationToken.None);
        }

        Assert.Equal(before, File.ReadAllBytes(file));
        Assert.Equal(written, File.GetLastWriteTimeUtc(file));
    }

    [Theory]
    [InlineData(4)]
    [InlineData(12)]
    [InlineData(-8)]
    public void A_damaged_view_file_reads_as_stale_and_the_view_is_built_from_the_catalog(int offset)
    {
        using var index = Index.Open(directory.Path);
        var file = WrittenView(index);

        // Offset 4 is the version, 12 the catalog stamp, −8 a byte near the end (a checksum mismatch).
        var bytes = File.ReadAllBytes(file);
        bytes[offset >= 0 ? offset : bytes.Length + offset] ^= 0x5A;
        File.WriteAllBytes(file, bytes);
        Assert.Null(ServingViewFile.TryRead(directory.Path, Encoder.Id, index.Catalog.CreatedTicks, index.Catalog.VectorSetGeneration, CandidateSource.Centroids, mapOnly: true, out var reason));
        Assert.NotEmpty(reason);

        using var reader = index.Views(readOnly: true);
        AssertMatchesCatalog(index, reader.For(Encoder.Id, CancellationToken.None));
        Assert.Equal(1, reader.Builds);
    }

    [Fact]
    public void Search_over_the_view_gives_the_hits_of_the_search_over_every_live_vector_set()
    {
        // Fewer pages than the candidate count, so the graph hands over every page and the two must agree exactly.
        using var index = Index.Open(directory.Path);
        index.AddPages([.. Enumerable.Range(0, 60)]);
        index.Embed([.. Enumerable.Range(0, 60)]);
        index.Unreference(7, 8);
        foreach (var (seed, source) in new[] { (101, CandidateSource.Graph), (102, CandidateSource.Centroids), (103, CandidateSource.All) })
        {
            using var views = index.Views(readOnly: false, source);
            var query = TestVectors.Set(seed, 4, Dimensions);
            var (result, unreadable) = views.Search(Encoder.Id, query, 10, CancellationToken.None);
            using var live = index.Store.OpenLive(Encoder.Id);
            var expected = LateInteractionSearch.Search(live.Source, query, new SearchOptions { Top = 10 }, CancellationToken.None);
            Assert.Equal(expected.Hits.Select(h => (h.Key, h.Score)), result.Hits.Select(h => (h.Key, h.Score)));
            Assert.Equal(58, result.PagesScanned);
            Assert.Equal(0, unreadable);
        }
    }

    [Fact]
    public void Centroid_lists_read_back_from_the_file_give_the_candidates_they_gave_when_written()
    {
        using var index = Index.Open(directory.Path);
        index.AddPages([.. Enumerable.Range(0, 80)]);
        index.Embed([.. Enumerable.Range(0, 80)]);
        var query = TestVectors.Set(200, 3, Dimensions);
        IReadOnlyList<Core.Search.ServingEntry> written;
        using (var writer = index.Views(readOnly: false))
        {
            written = writer.For(Encoder.Id, CancellationToken.None).Candidates(query, 20, handedOn: 20, probes: 3);
            writer.Persist(CancellationToken.None);
        }

        Assert.Equal(20, written.Count);
        using var reader = index.Views(readOnly: true);
        var read = reader.For(Encoder.Id, CancellationToken.None);
        Assert.Equal(0, reader.Builds);
        Assert.Equal(written, read.Candidates(query, 20, handedOn: 20, probes: 3));
    }

    [Fact]
    public void A_file_of_centroid_lists_serves_every_page_from_its_page_codes_but_a_graph_file_serves_only_the_graph()
    {
        using var index = Index.Open(directory.Path);
        index.AddPages([.. Enumerable.Range(0, 40)]);
        index.Embed([.. Enumerable.Range(0, 40)]);
        using (var writer = index.Views(readOnly: false, CandidateSource.Centroids))
        {
            writer.For(Encoder.Id, CancellationToken.None);
            writer.Persist(CancellationToken.None);
        }

        var query = TestVectors.Set(91, 3, Dimensions);
        var scores = SegmentHammingScores(index, query);
        using (var all = index.Views(readOnly: true, CandidateSource.All))
        {
            var view = all.For(Encoder.Id, CancellationToken.None);
            AssertMatchesCatalog(index, view);
            Assert.Equal(0, all.Builds);
            Assert.Equal(scores.Values.OrderDescending().Take(5), view.Candidates(query, 5, handedOn: 5).Select(e => scores[e.Key.Hex]).OrderDescending());
        }

        using (var writer = index.Views(readOnly: false, CandidateSource.Graph))
        {
            writer.For(Encoder.Id, CancellationToken.None);
            writer.Persist(CancellationToken.None);
        }

        foreach (var other in new[] { CandidateSource.All, CandidateSource.Centroids })
        {
            Assert.Null(ServingViewFile.TryRead(directory.Path, Encoder.Id, index.Catalog.CreatedTicks, index.Catalog.VectorSetGeneration, other, mapOnly: true, out var reason));
            Assert.Contains("Graph", reason, StringComparison.Ordinal);
        }

        using var every = index.Views(readOnly: true, CandidateSource.All);
        AssertMatchesCatalog(index, every.For(Encoder.Id, CancellationToken.None));
        Assert.Equal(1, every.Builds);
    }

    [Fact]
    public void A_writer_measures_the_recall_figure_before_it_writes_the_view_and_readers_see_it_without_writing()
    {
        // Fewer pages than the lists hand on, so the served search ranks every page and keeps the whole top-10.
        using var index = Index.Open(directory.Path);
        index.AddPages([.. Enumerable.Range(0, 50)]);
        index.Embed([.. Enumerable.Range(0, 50)]);
        using (var writer = index.Views(readOnly: false))
        {
            writer.For(Encoder.Id, CancellationToken.None);
            Assert.Null(writer.LastRecall(Encoder.Id));
            writer.Persist(CancellationToken.None);
            var measured = writer.LastRecall(Encoder.Id);
            Assert.NotNull(measured);
            Assert.Equal(1.0, measured.Recall);
            Assert.Equal(RecallSample.Queries, measured.Queries);
            Assert.Equal(index.Catalog.VectorSetGeneration, measured.Generation);
        }

        var file = ServingViewFile.PathOf(directory.Path, Encoder.Id);
        var written = File.GetLastWriteTimeUtc(file);
        using (var reader = index.Views(readOnly: true))
        {
            Assert.Equal(1.0, reader.LastRecall(Encoder.Id)?.Recall);
            reader.Persist(CancellationToken.None);
        }

        Assert.Equal(written, File.GetLastWriteTimeUtc(file));

        // A view of every page measures nothing: its candidates need no training.
        using var all = index.Views(readOnly: false, CandidateSource.All);
        index.Unreference(3);
        all.For(Encoder.Id, CancellationToken.None);
        all.Persist(CancellationToken.None);
        Assert.Null(all.LastRecall(Encoder.Id));
    }

    [Fact]
    public void A_retrained_view_answers_as_before_and_no_vector_set_or_segment_changes()
    {
        // Fewer pages than the lists hand on: both views rank every page, so their answers must be equal and exhaustive.
        using var index = Index.Open(directory.Path);
        index.AddPages([.. Enumerable.Range(0, 60)]);
        index.Embed([.. Enumerable.Range(0, 60)]);
        index.Store.SealAll();
        using var views = index.Views(readOnly: false);
        var query = TestVectors.Set(301, 4, Dimensions);
        var before = views.Search(Encoder.Id, query, 10, CancellationToken.None).Result.Hits.Select(h => (h.Key, h.Score)).ToList();
        var segments = SegmentFiles();
        var generation = index.Catalog.VectorSetGeneration;
        var live = index.Catalog.VectorSets.Live(Encoder.Id).Select(r => (r.PageKey, r.SegmentId, r.Offset)).ToList();
        var at = new DateTimeOffset(2026, 12, 2, 20, 0, 0, TimeSpan.Zero);

        var outcome = views.Retrain(Encoder.Id, at, CancellationToken.None);

        Assert.True(outcome.Swapped);
        Assert.Equal(1.0, outcome.Before.Recall);
        Assert.Equal(1.0, outcome.After.Recall);
        Assert.Equal(60, outcome.Pages);
        Assert.Equal(2, views.Builds);
        var view = views.For(Encoder.Id, CancellationToken.None);
        Assert.Equal(at, view.TrainedAt);
        Assert.Equal(0.0, view.AddedShareSinceTraining);
        Assert.Equal(before, views.Search(Encoder.Id, query, 10, CancellationToken.None).Result.Hits.Select(h => (h.Key, h.Score)));
        using (var every = index.Store.OpenLive(Encoder.Id))
        {
            Assert.Equal(LateInteractionSearch.Search(every.Source, query, new SearchOptions { Top = 10 }, CancellationToken.None).Hits.Select(h => (h.Key, h.Score)), before);
        }

        // A view is a cache: the catalog and the segment files are as they were.
        Assert.Equal(generation, index.Catalog.VectorSetGeneration);
        Assert.Equal(live, index.Catalog.VectorSets.Live(Encoder.Id).Select(r => (r.PageKey, r.SegmentId, r.Offset)));
        Assert.Equal(segments, SegmentFiles());

        // The new view is what the writer writes; a reader gets its centroids' candidates.
        views.Persist(CancellationToken.None);
        using var reader = index.Views(readOnly: true);
        Assert.Equal(view.Candidates(query, 20, handedOn: 20), reader.For(Encoder.Id, CancellationToken.None).Candidates(query, 20, handedOn: 20));
    }

    [Fact]
    public void The_share_added_since_training_is_kept_by_each_change()
    {
        using var index = Index.Open(directory.Path);
        index.AddPages([.. Enumerable.Range(0, 40)]);
        index.Embed([.. Enumerable.Range(0, 40)]);
        using var views = index.Views(readOnly: false);
        var view = views.For(Encoder.Id, CancellationToken.None);
        Assert.NotNull(view.TrainedAt);
        Assert.Equal(0.0, view.AddedShareSinceTraining);

        // Page p holds 3 + p % 5 vectors (Index.Embed).
        static int Vectors(IEnumerable<int> pages) => pages.Sum(p => 3 + (p % 5));
        index.AddPages(40, 41, 42, 43);
        index.Embed(40, 41, 42, 43);
        index.Unreference(0, 1, 41);
        views.For(Encoder.Id, CancellationToken.None);
        var live = Enumerable.Range(2, 38).Concat([40, 42, 43]).ToList();
        Assert.Equal((double)Vectors([40, 42, 43]) / Vectors(live), view.AddedShareSinceTraining!.Value, 12);
        var facts = views.Retraining(Encoder.Id, lastAttempt: null);
        Assert.NotNull(facts);
        Assert.Equal(live.Count, facts.Pages);
        Assert.Equal(view.AddedShareSinceTraining, facts.AddedShare);

        // Read back from its file (version 4 on keeps them) the view knows both and goes on counting.
        views.Persist(CancellationToken.None);
        using (var reader = index.Views(readOnly: true))
        {
            var read = reader.For(Encoder.Id, CancellationToken.None);
            Assert.Equal(0, reader.Builds);
            Assert.Equal(view.TrainedAt, read.TrainedAt);
            Assert.Equal(view.AddedShareSinceTraining, read.AddedShareSinceTraining);
        }

        using (var status = index.Views(readOnly: true))
        {
            // Status from the command line reads the figures from the file without building a view.
            Assert.Equal((view.TrainedAt, view.AddedShareSinceTraining), status.LastTraining(Encoder.Id));
            Assert.Equal(0, status.Builds);
        }

        views.Dispose();
        using var writer = index.Views(readOnly: false);
        var reopened = writer.For(Encoder.Id, CancellationToken.None);
        Assert.Equal(0, writer.Builds);
        index.AddPages(44);
        index.Embed(44);
        writer.For(Encoder.Id, CancellationToken.None);
        live.Add(44);
        Assert.Equal((double)Vectors([40, 42, 43, 44]) / Vectors(live), reopened.AddedShareSinceTraining!.Value, 12);
    }

    [Fact]
    public void A_view_file_of_an_older_version_reads_as_stale_and_the_view_is_built_again()
    {
        using var index = Index.Open(directory.Path);
        var file = WrittenView(index);

        // Version 3 with a matching checksum (CRC-32C, RFC 3720, over every byte before the trailer): a whole file
        // of the older layout, which must be refused for its version, not read field by field.
        var bytes = File.ReadAllBytes(file);
        BinaryPrimitives.WriteInt32LittleEndian(bytes.AsSpan(4), 3);
        BinaryPrimitives.WriteUInt32LittleEndian(bytes.AsSpan(bytes.Length - 4), Crc32C.Compute(bytes.AsSpan(0, bytes.Length - 4)));
        File.WriteAllBytes(file, bytes);
        Assert.Null(ServingViewFile.TryRead(directory.Path, Encoder.Id, index.Catalog.CreatedTicks, index.Catalog.VectorSetGeneration, CandidateSource.Centroids, mapOnly: true, out var reason));
        Assert.Contains("version 3", reason, StringComparison.Ordinal);
        Assert.Null(ServingViewFile.ReadFigures(directory.Path, Encoder.Id, CandidateSource.Centroids));

        using var reader = index.Views(readOnly: true);
        AssertMatchesCatalog(index, reader.For(Encoder.Id, CancellationToken.None));
        Assert.Equal(1, reader.Builds);
    }

    [Fact]
    public void Only_centroid_lists_are_retrained()
    {
        using var index = Index.Open(directory.Path);
        index.AddPages(0, 1, 2);
        index.Embed(0, 1, 2);
        using var views = index.Views(readOnly: false, CandidateSource.All);
        Assert.Throws<InvalidOperationException>(() => views.Retrain(Encoder.Id, DateTimeOffset.UtcNow, CancellationToken.None));
    }

    [Fact]
    public void Sample_positions_are_distinct_within_the_directory_and_fixed_by_the_seed()
    {
        var positions = RecallSample.Positions(1000, 16, seed: 7);
        Assert.Equal(16, positions.Distinct().Count());
        Assert.All(positions, p => Assert.InRange(p, 0, 999));
        Assert.Equal(positions, RecallSample.Positions(1000, 16, seed: 7));
        Assert.NotEqual(positions, RecallSample.Positions(1000, 16, seed: 8));
        Assert.Equal([0, 1, 2], RecallSample.Positions(3, 16, seed: 7));
    }

    [Fact]
    public void Fixed_dimensional_encodings_follow_the_definition_for_one_vector()
    {
        // Dhulipala et al., "MUVERA" (NeurIPS 2024), §2: a query sums its vectors per bucket, a page averages
        // them, and an empty page bucket takes the page vector of the nearest bucket. With one vector, the page
        // therefore holds its projection in every bucket, and the query in exactly one bucket per repetition.
        var encoding = new FixedDimensionalEncoding(Dimensions);
        var vector = TestVectors.Set(5, 1, Dimensions);
        var halves = vector.Vectors.ToArray().Select(v => (Half)v).ToArray();
        var page = new float[FixedDimensionalEncoding.Length];
        encoding.EncodePage(halves, page);
        var query = new float[FixedDimensionalEncoding.Length];
        encoding.EncodeQuery(halves.Select(h => (float)h).ToArray(), query);
        var cell = FixedDimensionalEncoding.ProjectionDimensions;
        var buckets = 1 << FixedDimensionalEncoding.BucketBits;
        for (var r = 0; r < FixedDimensionalEncoding.Repetitions; r++)
        {
            var first = page.AsSpan(r * buckets * cell, cell).ToArray();
            var filled = 0;
            for (var b = 0; b < buckets; b++)
            {
                Assert.Equal(first, page.AsSpan(((r * buckets) + b) * cell, cell).ToArray());
                if (query.AsSpan(((r * buckets) + b) * cell, cell).ToArray().Any(x => x != 0))
                {
                    filled++;
                    Assert.Equal(first, query.AsSpan(((r * buckets) + b) * cell, cell).ToArray());
                }
            }

            Assert.Equal(1, filled);
        }
    }

    /// <summary>Three pages embedded and their view written by a writer; the view file's path.</summary>
    private static string WrittenView(Index index)
    {
        index.AddPages(0, 1, 2);
        index.Embed(0, 1, 2);
        using (var writer = index.Views(readOnly: false))
        {
            writer.For(Encoder.Id, CancellationToken.None);
            writer.Persist(CancellationToken.None);
        }

        return ServingViewFile.PathOf(index.Path, Encoder.Id);
    }

    [Fact]
    public void Pages_tied_at_the_cut_of_a_view_of_every_page_are_kept_in_page_key_order_however_they_came()
    {
        // Twenty copies of one page's vectors under other keys, committed in descending key order one by one, so
        // the writer's view holds them in the opposite order to their keys: every score ties.
        using var index = Index.Open(directory.Path);
        var copies = Enumerable.Range(40, 20).OrderByDescending(p => TestVectors.Key(p).Hex, StringComparer.Ordinal).ToList();
        index.AddPages([.. copies]);
        using var views = index.Views(readOnly: false, CandidateSource.All);
        views.For(Encoder.Id, CancellationToken.None);
        var same = TestVectors.Set(1000, 3, Dimensions);
        foreach (var p in copies)
        {
            index.Store.AppendAndCommit(Encoder, [(TestVectors.Key(p), same)]);
        }

        var moved = views.For(Encoder.Id, CancellationToken.None).Candidates(same, 7, handedOn: 7).Select(e => e.Key.Hex).ToList();
        Assert.Equal(copies.Select(p => TestVectors.Key(p).Hex).Order(StringComparer.Ordinal).Take(7), moved);
        using var fresh = index.Views(readOnly: true, CandidateSource.All);
        Assert.Equal(moved, fresh.For(Encoder.Id, CancellationToken.None).Candidates(same, 7, handedOn: 7).Select(e => e.Key.Hex));
    }

    [Fact]
    public async Task A_search_does_not_wait_for_the_recall_pass_and_write_of_a_current_view_but_sees_every_commit()
    {
        using var index = Index.Open(directory.Path);
        index.AddPages([.. Enumerable.Range(0, 20)]);
        index.Embed([.. Enumerable.Range(0, 20)]);

        // The store is asked for whenever vector sets are read: armed, the next ask stops until released, so the
        // recall pass of the write below holds the views' gate at a known point (no timing).
        using var entered = new ManualResetEventSlim();
        using var release = new ManualResetEventSlim();
        var armed = 0;
        using var views = new ServingViews(index.Catalog, () =>
        {
            if (Interlocked.Exchange(ref armed, 0) == 1)
            {
                entered.Set();
                release.Wait();
            }

            return index.Store;
        }, directory.Path, readOnly: false, CandidateSource.Centroids);
        var page = TestVectors.Set(7, 3 + (7 % 5), Dimensions);
        Assert.Equal(TestVectors.Key(7), views.Search(Encoder.Id, page, 5, CancellationToken.None).Result.Hits[0].Key);

        Volatile.Write(ref armed, 1);
        var writing = Task.Run(() => views.Persist(CancellationToken.None));
        entered.Wait();
        try
        {
            // The gate is held by the recall pass of a view that shows the last commit: the search answers from it.
            // (A search that waited for the gate would wait for the release: the wait below fails it instead.)
            var during = await Task.Run(() => views.Search(Encoder.Id, page, 5, CancellationToken.None).Result.Hits).WaitAsync(TimeSpan.FromMinutes(2));
            Assert.Equal(TestVectors.Key(7), during[0].Key);
            Assert.False(writing.IsCompleted);
        }
        finally
        {
            release.Set();
        }

        await writing;

        // A commit since: the search sees it (the view moves first).
        index.AddPages(30);
        index.Embed(30);
        var newPage = TestVectors.Set(30, 3, Dimensions);
        Assert.Equal(TestVectors.Key(30), views.Search(Encoder.Id, newPage, 5, CancellationToken.None).Result.Hits[0].Key);
    }

    /// <summary>Per live page (hex key) its Hamming MaxSim over the sign codes its segment record holds.</summary>
    private static Dictionary<string, int> SegmentHammingScores(Index index, VectorSet query)
    {
        var queryCodes = new ulong[query.Count * SignCodes.WordsPerCode(Dimensions)];
        SignCodes.Compute(query.Vectors, Dimensions, queryCodes);
        using var live = index.Store.OpenLive(Encoder.Id);
        var closest = new int[query.Count];
        var scores = new Dictionary<string, int>();
        for (var i = 0; i < live.Source.Count; i++)
        {
            var page = live.Source.Get(i);
            if (page.Count > 0)
            {
                scores[page.Key.Hex] = MaxSimKernels.Hamming(queryCodes, page.SignCodes, Dimensions, closest);
            }
        }

        return scores;
    }

    private static void AssertMatchesCatalog(Index index, ServingView view)
    {
        var live = index.Catalog.VectorSets.Live(Encoder.Id);
        Assert.Equal(index.Catalog.VectorSetGeneration, view.Generation);
        Assert.Equal(
            live.Select(v => (v.PageKey, v.SegmentId, v.Offset, v.Length, v.VectorCount)),
            view.Entries().Select(e => (e.Key.Hex, e.Location.SegmentId, e.Location.Offset, e.Location.Length, e.VectorCount)));
    }

    private List<(string Name, long Length, DateTime Written)> SegmentFiles() =>
        [.. Directory.EnumerateFiles(System.IO.Path.Combine(directory.Path, VectorStore.SegmentsFolder)).Order(StringComparer.Ordinal)
            .Select(f => (System.IO.Path.GetFileName(f), new FileInfo(f).Length, File.GetLastWriteTimeUtc(f)))];

    /// <summary>A small index opened for writing, with the few changes the tests make.</summary>
    private sealed class Index : IDisposable
    {
        private readonly IndexLock held;

        private Index(string path)
        {
            Path = path;
            held = IndexLock.Acquire(path, "serving view test");
            Catalog = IndexCatalog.Open(held);
            Store = VectorStore.Open(Catalog, path);
        }

        public string Path { get; }

        public IndexCatalog Catalog { get; }

        public VectorStore Store { get; }

        public static Index Open(string path) => new(path);

        public ServingViews Views(bool readOnly, CandidateSource source = CandidateSource.Centroids) => new(Catalog, () => Store, Path, readOnly, source);

        public void AddPages(params int[] pages)
        {
            var edit = new CatalogEdit();
            edit.AddPages.AddRange(pages.Select(p => new PageRecord { Id = TestVectors.Key(p).Hex, References = 1 }));
            Catalog.Apply(edit);
        }

        public void Embed(params int[] pages) => Store.AppendAndCommit(Encoder, [.. pages.Select(p => (TestVectors.Key(p), TestVectors.Set(p, 3 + (p % 5), Dimensions)))]);

        public void Unreference(params int[] pages)
        {
            var edit = new CatalogEdit();
            edit.SetReferences.AddRange(pages.Select(p => (TestVectors.Key(p).Hex, 0)));
            Catalog.Apply(edit);
            Catalog.RemoveUnreferencedPages();
        }

        public void Dispose()
        {
            Store.Dispose();
            Catalog.Dispose();
            held.Dispose();
        }
    }
}
