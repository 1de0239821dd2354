using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Compaction;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Index;
using IndexKeeper.Core.Search;
using IndexKeeper.Core.Storage;
using IndexKeeper.Tests.Storage;
using Xunit.Abstractions;

namespace IndexKeeper.Tests.Crash;

/// <summary>
/// Compaction rewrites and retires segments while other threads search: every search, whether it opened
/// its live vectors before, during or after a swap, must give exactly the answer the index gave before
/// compaction (same page keys, same scores, same order), and a retired file must stay on disk until the
/// last reader that holds it is disposed, then go.
/// </summary>
public sealed class CompactionUnderSearchTests(ITestOutputHelper output)
{
    private const int Dimensions = 64;
    private const int Readers = 2;
    private static readonly EncoderIdentity Encoder = OpenIndex.Encoder;

    [Fact]
    public void Searches_during_compaction_match_the_answers_before_it()
    {
        using var directory = new Support.TempDirectory();
        using var indexLock = IndexLock.Acquire(directory.Path, "compaction under search test");
        using var catalog = IndexCatalog.Open(indexLock);

        // Segments sealed at 64 KiB: about 20 records of 3 KiB each, so 240 pages make a dozen segments.
        using var store = VectorStore.Open(catalog, directory.Path, new SegmentWriterOptions { SealAtBytes = 64 * 1024 });
        var options = new CompactionOptions { SmallSegmentBytes = 128 * 1024, MinSmallSegmentsToMerge = 2, TargetSegmentBytes = 256 * 1024 };
        var queries = Enumerable.Range(0, 12).Select(q => Normalized(TestVectors.Set(10_000 + q, 6, Dimensions))).ToList();
        var next = 0;
        var random = new Random(7);
        for (var round = 1; round <= 3; round++)
        {
            // New pages, then a share of all pages dies: dead bytes and small segments for the policy.
            var clock = System.Diagnostics.Stopwatch.StartNew();
            Add(catalog, store, Enumerable.Range(next, 80).ToList());
            var appendMilliseconds = clock.ElapsedMilliseconds;
            next += 80;
            var live = catalog.Pages.All().Where(p => p.References > 0).Select(p => p.Id).ToList();
            Kill(catalog, live.Where(_ => random.NextDouble() < 0.3).ToList());
            store.SealAll();

            var expected = SearchAll(store, queries);
            var before = catalog.Segments.All().Select(s => s.Id).ToHashSet();
            using var heldAcross = store.OpenLive(Encoder.Id);

            var failures = new List<string>();
            var passes = new int[Readers];
            var compacting = 0;
            var passesDuringCompaction = 0;
            using var started = new CountdownEvent(Readers);
            var stop = false;
            var threads = Enumerable.Range(0, Readers).Select(reader => new Thread(() =>
            {
                var signalled = false;
                while (!Volatile.Read(ref stop))
                {
                    // One query per open: the opening of live vectors is what races a swap.
                    var during = Volatile.Read(ref compacting) == 1;
                    var q = passes[reader] % queries.Count;
                    try
                    {
                        using var live = store.OpenLive(Encoder.Id);
                        var answer = Search(live, [queries[q]])[0];
                        if (!answer.SequenceEqual(expected[q]))
                        {
                            lock (failures)
                            {
                                failures.Add($"reader {reader}, pass {passes[reader]}, query {q}: {string.Join(", ", answer)} instead of {string.Join(", ", expected[q])}");
                            }
                        }
                    }
                    catch (Exception error)
                    {
                        lock (failures)
                        {
                            failures.Add($"reader {reader}, pass {passes[reader]}: {error.GetType().Name}: {error.Message}");
                        }
                    }

                    passes[reader]++;
                    if (during && Volatile.Read(ref compacting) == 1)
                    {
                        Interlocked.Increment(ref passesDuringCompaction);
                    }

                    if (!signalled)
                    {
                        started.Signal();
                        signalled = true;
                    }
                }
            })).ToList();
            threads.ForEach(t => t.Start());
            started.Wait();

            Volatile.Write(ref compacting, 1);
            clock.Restart();
            var report = store.Compact(options, CancellationToken.None);
            Volatile.Write(ref compacting, 0);
            var compactMilliseconds = clock.ElapsedMilliseconds;
            var afterCompaction = passes.ToArray();

            // Each reader searches every query over the new segments before the readers stop.
            SpinWait.SpinUntil(() => Enumerable.Range(0, Readers).All(r => Volatile.Read(ref passes[r]) > afterCompaction[r] + queries.Count));
            Volatile.Write(ref stop, true);
            threads.ForEach(t => t.Join());
            output.WriteLine($"round {round}: appends {appendMilliseconds} ms; {report.Jobs} jobs rewrote {report.SegmentsRewritten} segments in {compactMilliseconds} ms; reader passes {string.Join("/", passes)}, {passesDuringCompaction} of them wholly during compaction; {failures.Count} failures");
            Assert.True(failures.Count == 0, string.Join("\n", failures));
            Assert.True(report.SegmentsRewritten > 0, "the policy found nothing to compact: the test set-up gives it no work");

            var retired = before.Except(catalog.Segments.All().Select(s => s.Id)).ToList();
            Assert.NotEmpty(retired);

            // The reader opened before compaction still holds every retired file and still gets the old answers.
            Assert.All(retired, id => Assert.True(File.Exists(SegmentFileNames.PathOf(store.Directory, id)), $"segment {id} was deleted while a reader held it"));
            Assert.Equal(expected, Search(heldAcross, queries));
            heldAcross.Dispose();
            Assert.All(retired, id => Assert.False(File.Exists(SegmentFileNames.PathOf(store.Directory, id)), $"segment {id} outlived its last reader"));
            Assert.Equal(catalog.Segments.All().Select(s => SegmentFileNames.PathOf(store.Directory, s.Id)).Order(), Directory.GetFiles(store.Directory).Order());
            Assert.Equal(expected, SearchAll(store, queries));
        }
    }

    private static void Add(IndexCatalog catalog, VectorStore store, IReadOnlyList<int> pages)
    {
        var edit = new CatalogEdit();
        edit.AddPages.AddRange(pages.Select(p => new PageRecord { Id = TestVectors.Key(p).Hex, References = 1 }));
        catalog.Apply(edit);
        foreach (var batch in pages.Chunk(8))
        {
            store.AppendAndCommit(Encoder, batch.Select(p => (TestVectors.Key(p), Normalized(TestVectors.Set(p, 20, Dimensions)))).ToList());
        }
    }

    private static void Kill(IndexCatalog catalog, IReadOnlyList<string> keys)
    {
        var edit = new CatalogEdit();
        edit.SetReferences.AddRange(keys.Select(k => (k, 0)));
        catalog.Apply(edit);
        catalog.RemoveUnreferencedPages();
    }

    private static List<List<string>> SearchAll(VectorStore store, IReadOnlyList<VectorSet> queries)
    {
        using var live = store.OpenLive(Encoder.Id);
        return Search(live, queries);
    }

    /// <summary>The top 10 of each query as "key score" strings, best first; two-stage search with its default candidate count.</summary>
    private static List<List<string>> Search(LiveVectors live, IReadOnlyList<VectorSet> queries) =>
        [.. queries.Select(q => LateInteractionSearch.Search(live.Source, q, new SearchOptions { Top = 10, Parallelism = 1 }, CancellationToken.None)
            .Hits.Select(h => $"{h.Key.Hex[..12]} {h.Score:R}").ToList())];

    private static VectorSet Normalized(VectorSet set)
    {
        var vectors = set.Vectors.ToArray();
        for (var row = 0; row < set.Count; row++)
        {
            var span = vectors.AsSpan(row * set.Dimensions, set.Dimensions);
            var norm = MathF.Sqrt(System.Numerics.Tensors.TensorPrimitives.SumOfSquares(span));
            System.Numerics.Tensors.TensorPrimitives.Divide(span, norm, span);
        }

        return new VectorSet(set.Dimensions, vectors, set.Regions);
    }
}
