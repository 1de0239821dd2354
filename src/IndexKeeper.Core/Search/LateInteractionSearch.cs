using System.Buffers;
using System.Runtime.ExceptionServices;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Core.Search;

/// <summary>
/// Late-interaction top-k over a vector-set source (docs/search.md): a first stage ranks every page by
/// Hamming MaxSim on sign codes and keeps the best candidates; an exact MaxSim on float16 re-ranks them and
/// the hits carry, per query token, the page vector and region that matched.
/// </summary>
public static class LateInteractionSearch
{
    // Ordinals handed to a thread at a time: large enough to amortise scheduling, small enough to balance two cores.
    private const int ChunkSize = 64;

    /// <exception cref="InvalidOperationException">A page's dimensions differ from the query's.</exception>
    public static SearchResult Search(IVectorSetSource source, VectorSet query, SearchOptions options, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(source);
        ArgumentNullException.ThrowIfNull(query);
        ArgumentNullException.ThrowIfNull(options);
        if (query.Dimensions % 64 != 0)
        {
            throw new ArgumentException($"Query dimensions {query.Dimensions} are not a multiple of 64, so they have no sign code.", nameof(query));
        }

        var count = source.Count;
        if (query.Count == 0 || count == 0)
        {
            return new SearchResult([], count, 0);
        }

        var candidates = options.EffectiveCandidates;
        int[] ordinals;
        if (candidates >= count)
        {
            ordinals = [.. Enumerable.Range(0, count)];
        }
        else
        {
            ordinals = [.. FirstStage(source, query, candidates, options.Parallelism, cancellationToken).Select(c => c.Ordinal)];
        }

        var top = Rerank(source, query, ordinals, options.Top, options.Parallelism, cancellationToken);
        var hits = top.Select(t => Hit(source, query, t.Ordinal, t.Score)).ToList();
        return new SearchResult(hits, count, ordinals.Length);
    }

    /// <summary>The best <paramref name="candidates"/> pages by Hamming MaxSim, best first.</summary>
    internal static (float Score, int Ordinal)[] FirstStage(IVectorSetSource source, VectorSet query, int candidates, int parallelism, CancellationToken cancellationToken)
    {
        var dimensions = query.Dimensions;
        var queryCodes = new ulong[query.Count * SignCodes.WordsPerCode(dimensions)];
        SignCodes.Compute(query.Vectors, dimensions, queryCodes);
        var all = Enumerable.Range(0, source.Count).ToArray();
        return Scan(all, candidates, parallelism, cancellationToken, () => new int[query.Count], static _ => { }, (ordinal, closest, top) =>
        {
            var page = source.Get(ordinal);
            CheckDimensions(page.Dimensions, dimensions, ordinal);
            if (page.Count > 0)
            {
                top.Offer(MaxSimKernels.Hamming(queryCodes, page.SignCodes, dimensions, closest), ordinal);
            }
        });
    }

    /// <summary>The best <paramref name="top"/> of the given ordinals by exact MaxSim on float16, best first.</summary>
    internal static (float Score, int Ordinal)[] Rerank(IVectorSetSource source, VectorSet query, int[] ordinals, int top, int parallelism, CancellationToken cancellationToken)
    {
        var dimensions = query.Dimensions;
        return Scan(
            ordinals,
            top,
            parallelism,
            cancellationToken,
            () => new ExactScratch(query.Count, dimensions),
            static scratch => scratch.Dispose(),
            (ordinal, scratch, best) =>
            {
                var page = source.Get(ordinal);
                CheckDimensions(page.Dimensions, dimensions, ordinal);
                if (page.Count > 0)
                {
                    best.Offer(MaxSimKernels.Exact(query.Vectors, page.Vectors, dimensions, scratch.Block, scratch.Similarity, scratch.Index), ordinal);
                }
            });
    }

    // Both cores: chunks of ordinals go to worker threads, each with its own scratch and heap, merged at the end.
    internal static (float Score, int Ordinal)[] Scan<TScratch>(
        int[] ordinals,
        int keep,
        int parallelism,
        CancellationToken cancellationToken,
        Func<TScratch> createScratch,
        Action<TScratch> release,
        Action<int, TScratch, TopScores> score)
    {
        var merged = new TopScores(keep);
        var chunks = (ordinals.Length + ChunkSize - 1) / ChunkSize;
        var parallelOptions = new ParallelOptions { MaxDegreeOfParallelism = parallelism, CancellationToken = cancellationToken };
        try
        {
            Parallel.For(
                0,
                chunks,
                parallelOptions,
                () => (Scratch: createScratch(), Top: new TopScores(keep)),
                (chunk, _, local) =>
                {
                    cancellationToken.ThrowIfCancellationRequested();
                    var end = Math.Min(ordinals.Length, (chunk + 1) * ChunkSize);
                    for (var i = chunk * ChunkSize; i < end; i++)
                    {
                        score(ordinals[i], local.Scratch, local.Top);
                    }

                    return local;
                },
                local =>
                {
                    lock (merged)
                    {
                        local.Top.AddTo(merged);
                    }

                    release(local.Scratch);
                });
        }
        catch (AggregateException error) when (error.InnerExceptions.Count > 0)
        {
            // Callers see the first failure itself, e.g. a dimension mismatch, not the parallel wrapper.
            ExceptionDispatchInfo.Throw(error.InnerExceptions[0]);
        }

        return merged.ToSorted();
    }

    private static SearchHit Hit(IVectorSetSource source, VectorSet query, int ordinal, float score)
    {
        var page = source.Get(ordinal);
        using var scratch = new ExactScratch(query.Count, query.Dimensions);
        MaxSimKernels.Exact(query.Vectors, page.Vectors, query.Dimensions, scratch.Block, scratch.Similarity, scratch.Index);
        var matches = new TokenMatch[query.Count];
        for (var q = 0; q < matches.Length; q++)
        {
            var row = scratch.Index[q];
            matches[q] = new TokenMatch(row, scratch.Similarity[q], page.Regions[row]);
        }

        return new SearchHit(ordinal, page.Key, score, matches);
    }

    private static void CheckDimensions(int page, int query, int ordinal)
    {
        if (page != query)
        {
            throw new InvalidOperationException($"Vector set {ordinal} has {page} dimensions, the query {query}: they come from different encoders.");
        }
    }

    /// <summary>Per-thread buffers of the exact stage, rented once per thread rather than per page.</summary>
    private sealed class ExactScratch : IDisposable
    {
        private readonly float[] block;
        private readonly float[] similarity;
        private readonly int[] index;

        public ExactScratch(int tokens, int dimensions)
        {
            block = ArrayPool<float>.Shared.Rent(MaxSimKernels.BlockRows * dimensions);
            similarity = ArrayPool<float>.Shared.Rent(tokens);
            index = ArrayPool<int>.Shared.Rent(tokens);
        }

        public Span<float> Block => block;

        public Span<float> Similarity => similarity;

        public Span<int> Index => index;

        public void Dispose()
        {
            ArrayPool<float>.Shared.Return(block);
            ArrayPool<float>.Shared.Return(similarity);
            ArrayPool<int>.Shared.Return(index);
        }
    }
}
