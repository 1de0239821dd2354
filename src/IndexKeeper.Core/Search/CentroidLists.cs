using System.Numerics.Tensors;

namespace IndexKeeper.Core.Search;

/// <summary>
/// Candidate pages from centroid inverted lists, after Santhanam, Khattab, Potts and Zaharia, "PLAID: An
/// Efficient Engine for Late Interaction Retrieval" (CIKM 2022, arXiv:2205.09707): k-means centroids trained on a
/// sample of the index's vectors; each page keeps the distinct centroid ids of its vectors (its codes) and sits
/// in the inverted list of each; a query token probes its nearest centroids and the pages of those lists are the
/// candidates. Only when they are more than asked for are they cut by PLAID's centroid interaction (per query
/// token the best centroid score among the page's codes, summed). PLAID's residuals are not kept: the serving
/// view's sign-code stage ranks the candidates and its float16 re-rank reads the stored vectors
/// (docs/search.md, "Candidates"; measured in docs/benchmarks.md, <c>serving</c>).
/// </summary>
/// <remarks>
/// Adds are assigned to the trained centroids and appended; removes leave a tombstone until a quarter of the
/// slots are dead, then the lists are rebuilt from the codes. The centroids do not follow the content: their
/// quality under churn is measured by the recall figure, and retraining is a new build. Not safe for a write
/// beside any other call: the serving view's lock orders them.
/// </remarks>
internal sealed class CentroidLists
{
    /// <summary>Centroid ids are written as 16-bit numbers (docs/serving-view.md).</summary>
    public const int MaximumCentroids = 4096;

    public const int MinimumCentroids = 64;

    /// <summary>Sample vectors per centroid for k-means and Lloyd iterations: enough for stable centroids at a build's cost (common practice).</summary>
    public const int SamplePerCentroid = 16;

    public const int Iterations = 8;

    /// <summary>
    /// A vector goes to the best of this many centroids by sign-code Hamming distance (the angle estimate of
    /// Charikar, STOC 2002), chosen by exact dot product: 16 popcounts stand in for most of the float dot
    /// products of a build. Queries use the same rule, so a query token meets the list of an equal page vector.
    /// </summary>
    public const int Shortlist = 16;

    private readonly int dimensions;
    private readonly float[] centroids;
    private readonly ulong[] centroidCodes;
    private readonly Dictionary<ulong, int> slotOf = [];
    private readonly List<ulong> idOf = [];
    private readonly List<ushort[]?> codesOf = [];
    private List<int>[] postings;
    private int dead;

    private CentroidLists(int dimensions, float[] centroids)
    {
        this.dimensions = dimensions;
        this.centroids = centroids;
        centroidCodes = new ulong[CentroidCount * SignCodes.WordsPerCode(dimensions)];
        SignCodes.Compute(centroids, dimensions, centroidCodes);
        postings = NewPostings(CentroidCount);
    }

    public int CentroidCount => centroids.Length / dimensions;

    public int Count => slotOf.Count;

    /// <summary>Centroids, row-major, <c>CentroidCount × dimensions</c>.</summary>
    public ReadOnlySpan<float> Centroids => centroids;

    /// <summary>Bytes held: centroids, codes (2 B each), list entries (4 B each) and per-page overhead.</summary>
    public long BytesEstimate => (centroids.Length * 4L) + codesOf.Sum(c => c is null ? 8L : 40L + (c.Length * 6L)) + (slotOf.Count * 24L);

    /// <summary>
    /// Centroids for an index of <paramref name="vectors"/> vectors: a power of two near 2·√vectors, within
    /// [<see cref="MinimumCentroids"/>, <see cref="MaximumCentroids"/>]. PLAID takes 16·√vectors; fewer here keep
    /// a build's assignment affordable on two cores (chosen by measurement, docs/benchmarks.md, <c>serving</c>).
    /// </summary>
    public static int CentroidsFor(long vectors)
    {
        var wanted = 2 * Math.Sqrt(Math.Max(1, vectors));
        var power = 1 << (int)Math.Round(Math.Log2(wanted));
        return Math.Clamp(power, MinimumCentroids, MaximumCentroids);
    }

    /// <summary>
    /// Spherical k-means (dot product, centroids normalised) on <paramref name="sample"/> rows: the initial
    /// centroids are rows taken at an even stride, so the result depends only on the sample.
    /// </summary>
    public static CentroidLists Train(float[] sample, int dimensions, int centroidCount, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(sample);
        var rows = sample.Length / dimensions;
        centroidCount = Math.Clamp(Math.Min(centroidCount, rows), 1, MaximumCentroids);
        var centroids = new float[centroidCount * dimensions];
        for (var c = 0; c < centroidCount; c++)
        {
            sample.AsSpan((int)((long)c * rows / centroidCount) * dimensions, dimensions).CopyTo(centroids.AsSpan(c * dimensions));
        }

        var lists = new CentroidLists(dimensions, centroids);
        var assigned = new int[rows];
        for (var iteration = 0; iteration < Iterations; iteration++)
        {
            Parallel.For(0, rows, new ParallelOptions { CancellationToken = cancellationToken }, r => assigned[r] = lists.Nearest(sample.AsSpan(r * dimensions, dimensions)));
            var sums = new float[centroids.Length];
            var members = new int[centroidCount];
            for (var r = 0; r < rows; r++)
            {
                TensorPrimitives.Add(sums.AsSpan(assigned[r] * dimensions, dimensions), sample.AsSpan(r * dimensions, dimensions), sums.AsSpan(assigned[r] * dimensions, dimensions));
                members[assigned[r]]++;
            }

            for (var c = 0; c < centroidCount; c++)
            {
                // An empty cluster keeps its centroid; a filled one moves to the normalised mean of its members.
                var sum = sums.AsSpan(c * dimensions, dimensions);
                var norm = TensorPrimitives.Norm(sum);
                if (members[c] > 0 && norm > 0)
                {
                    TensorPrimitives.Divide(sum, norm, centroids.AsSpan(c * dimensions, dimensions));
                }
            }
        }

        SignCodes.Compute(centroids, dimensions, lists.centroidCodes);
        return lists;
    }

    /// <summary>Lists over stored centroids and page codes, as the serving view file keeps them.</summary>
    public static CentroidLists Restore(int dimensions, float[] centroids, IEnumerable<(ulong Id, ushort[] Codes)> pages)
    {
        ArgumentNullException.ThrowIfNull(pages);
        var lists = new CentroidLists(dimensions, centroids);
        foreach (var (id, codes) in pages)
        {
            if (codes.Any(c => c >= lists.CentroidCount))
            {
                throw new FormatException($"A page's centroid id is outside the {lists.CentroidCount} centroids.");
            }

            lists.Add(id, codes);
        }

        return lists;
    }

    /// <summary>The distinct centroid ids of a page's vectors (given with their sign codes), ascending.</summary>
    public ushort[] Assign(ReadOnlySpan<Half> vectors, ReadOnlySpan<ulong> signCodes)
    {
        var words = SignCodes.WordsPerCode(dimensions);
        var rows = vectors.Length / dimensions;
        var row = new float[dimensions];
        var shortlist = new Shortlisted(Shortlist);
        var codes = new SortedSet<ushort>();
        for (var r = 0; r < rows; r++)
        {
            TensorPrimitives.ConvertToSingle(vectors.Slice(r * dimensions, dimensions), row);
            codes.Add((ushort)Assigned(row, signCodes.Slice(r * words, words), shortlist));
        }

        return [.. codes];
    }

    /// <summary>The codes of a page in the lists; null when it is not there.</summary>
    public ushort[]? CodesOf(ulong id) => slotOf.TryGetValue(id, out var slot) ? codesOf[slot] : null;

    public void Add(ulong id, ushort[] codes)
    {
        ArgumentNullException.ThrowIfNull(codes);
        Remove(id);
        var slot = idOf.Count;
        idOf.Add(id);
        codesOf.Add(codes);
        slotOf[id] = slot;
        foreach (var code in codes)
        {
            postings[code].Add(slot);
        }
    }

    public void Remove(ulong id)
    {
        if (!slotOf.Remove(id, out var slot))
        {
            return;
        }

        codesOf[slot] = null;
        if (++dead > Math.Max(1024, idOf.Count / 4))
        {
            Rebuild();
        }
    }

    /// <summary>
    /// Ids of the pages listed under the centroids each query token (rows of <paramref name="query"/>) probes: the
    /// one its vector would be assigned to and the nearest others by dot product, <paramref name="probes"/> in
    /// all. When they are more than <paramref name="count"/>, the <paramref name="count"/> with the highest
    /// centroid interaction, best first (ties to the earlier slot); else all of them in slot order.
    /// </summary>
    public ulong[] Nearest(ReadOnlySpan<float> query, int probes, int count, CancellationToken cancellationToken)
    {
        var tokens = query.Length / dimensions;
        var centroidCount = CentroidCount;
        probes = Math.Clamp(probes, 1, centroidCount);
        var table = new float[tokens * centroidCount];
        var probed = new bool[centroidCount];
        var order = new int[centroidCount];
        var words = SignCodes.WordsPerCode(dimensions);
        var queryCodes = new ulong[tokens * words];
        SignCodes.Compute(query, dimensions, queryCodes);
        var shortlist = new Shortlisted(Shortlist);
        for (var q = 0; q < tokens; q++)
        {
            probed[Assigned(query.Slice(q * dimensions, dimensions), queryCodes.AsSpan(q * words, words), shortlist)] = true;
            var scores = table.AsSpan(q * centroidCount, centroidCount);
            for (var c = 0; c < centroidCount; c++)
            {
                scores[c] = TensorPrimitives.Dot(query.Slice(q * dimensions, dimensions), centroids.AsSpan(c * dimensions, dimensions));
                order[c] = c;
            }

            var keys = scores.ToArray();
            Array.Sort(keys, order);
            for (var i = 1; i < probes; i++)
            {
                probed[order[^i]] = true;
            }
        }

        var seen = new bool[idOf.Count];
        var candidates = new List<int>();
        for (var c = 0; c < centroidCount; c++)
        {
            if (!probed[c])
            {
                continue;
            }

            foreach (var slot in postings[c])
            {
                if (!seen[slot] && codesOf[slot] is not null)
                {
                    seen[slot] = true;
                    candidates.Add(slot);
                }
            }
        }

        if (candidates.Count <= count)
        {
            return [.. candidates.Order().Select(slot => idOf[slot])];
        }

        var merged = new TopScores(count);
        Parallel.For(
            0,
            (candidates.Count + 255) / 256,
            new ParallelOptions { CancellationToken = cancellationToken },
            () => new TopScores(count),
            (chunk, _, local) =>
            {
                var end = Math.Min(candidates.Count, (chunk + 1) * 256);
                for (var i = chunk * 256; i < end; i++)
                {
                    local.Offer(Interaction(table, tokens, codesOf[candidates[i]]!), candidates[i]);
                }

                return local;
            },
            local =>
            {
                lock (merged)
                {
                    local.AddTo(merged);
                }
            });
        return [.. merged.ToSorted().Select(s => idOf[s.Ordinal])];
    }

    private static float Interaction(float[] table, int tokens, ushort[] codes)
    {
        var centroidCount = table.Length / tokens;
        var total = 0f;
        for (var q = 0; q < tokens; q++)
        {
            var best = float.NegativeInfinity;
            var offset = q * centroidCount;
            foreach (var code in codes)
            {
                best = Math.Max(best, table[offset + code]);
            }

            total += best;
        }

        return total;
    }

    private static List<int>[] NewPostings(int count) => [.. Enumerable.Range(0, count).Select(_ => new List<int>())];

    /// <summary>The centroid of <see cref="Shortlist"/> by fewest differing sign bits (ties: lower id) with the largest dot product.</summary>
    private int Assigned(ReadOnlySpan<float> row, ReadOnlySpan<ulong> code, Shortlisted shortlist)
    {
        var words = code.Length;
        shortlist.Clear();
        for (var c = 0; c < CentroidCount; c++)
        {
            var distance = 0;
            for (var w = 0; w < words; w++)
            {
                distance += System.Numerics.BitOperations.PopCount(code[w] ^ centroidCodes[(c * words) + w]);
            }

            shortlist.Offer(distance, c);
        }

        var best = -1;
        var bestScore = float.NegativeInfinity;
        for (var i = 0; i < shortlist.Count; i++)
        {
            var c = shortlist[i];
            var score = TensorPrimitives.Dot(row, centroids.AsSpan(c * dimensions, dimensions));
            if (best < 0 || score > bestScore)
            {
                bestScore = score;
                best = c;
            }
        }

        return best;
    }

    private int Nearest(ReadOnlySpan<float> row)
    {
        var best = 0;
        var bestScore = float.NegativeInfinity;
        for (var c = 0; c < CentroidCount; c++)
        {
            var score = TensorPrimitives.Dot(row, centroids.AsSpan(c * dimensions, dimensions));
            if (score > bestScore)
            {
                bestScore = score;
                best = c;
            }
        }

        return best;
    }

    /// <summary>The centroids with the fewest differing bits seen so far, in (distance, id) order.</summary>
    private sealed class Shortlisted(int capacity)
    {
        private readonly int[] distances = new int[capacity];
        private readonly int[] ids = new int[capacity];

        public int Count { get; private set; }

        public int this[int index] => ids[index];

        public void Clear() => Count = 0;

        /// <summary>REQUIRES: ids offered in ascending order, so an equal distance keeps the earlier id.</summary>
        public void Offer(int distance, int id)
        {
            if (Count == distances.Length && distance >= distances[Count - 1])
            {
                return;
            }

            var at = Count < distances.Length ? Count++ : Count - 1;
            while (at > 0 && distances[at - 1] > distance)
            {
                distances[at] = distances[at - 1];
                ids[at] = ids[at - 1];
                at--;
            }

            distances[at] = distance;
            ids[at] = id;
        }
    }

    /// <summary>Drops the tombstones: slots renumbered in their order, lists made again from the codes.</summary>
    private void Rebuild()
    {
        var live = idOf.Select((id, slot) => (Id: id, Codes: codesOf[slot])).Where(p => p.Codes is not null).ToList();
        idOf.Clear();
        codesOf.Clear();
        slotOf.Clear();
        postings = NewPostings(CentroidCount);
        dead = 0;
        foreach (var (id, codes) in live)
        {
            Add(id, codes!);
        }
    }
}
