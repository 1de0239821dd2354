using System.Buffers;
using System.Numerics;
using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Numerics.Tensors;

namespace IndexKeeper.Core.Search;

/// <summary>
/// Candidate pages from centroid inverted lists of vectors, after Santhanam, Khattab, Potts and Zaharia, "PLAID:
/// An Efficient Engine for Late Interaction Retrieval" (CIKM 2022, arXiv:2205.09707) and Scheerer et al., "WARP:
/// An Efficient Engine for Multi-Vector Retrieval" (SIGIR 2025, arXiv:2501.17788): k-means centroids trained on a
/// sample of the index's vectors; every stored vector's sign code is kept page by page (the stand-in for PLAID's
/// residuals) and its position is in the list of its centroid. A query token probes a few centroids and scores the
/// entries of their lists by the sign codes' dot product; per page and token the best entry counts, and a token that
/// found nothing on a page is imputed the lowest score it saw (WARP's imputation of missing similarities). The pages
/// with the best sums are then scored by Hamming MaxSim over all their vectors' codes (PLAID's full scoring of
/// candidates from their stored codes), and the best of those are the candidates of the exact re-rank
/// (docs/search.md, "Candidates"; docs/benchmarks.md, <c>serving</c>).
/// </summary>
/// <remarks>
/// Adds are assigned to the trained centroids and appended; removes leave a tombstone until a quarter of the
/// slots are dead, then the page codes are compacted and the lists made again. The centroids do not follow the content: their quality under
/// churn is the recall figure (docs/search.md, "Recall"), and retraining is a new build. Not safe for a write
/// beside any other call: the serving view's lock orders them.
/// </remarks>
internal sealed class CentroidLists
{
    /// <summary>Centroid ids are written as 16-bit numbers (docs/serving-view.md).</summary>
    public const int MaximumCentroids = 16384;

    public const int MinimumCentroids = 64;

    /// <summary>Sample vectors per centroid for k-means: enough for stable centroids at a build's cost (common practice).</summary>
    public const int SamplePerCentroid = 16;

    public const int Iterations = 8;

    /// <summary>
    /// A vector goes to the best of this many centroids by sign-code Hamming distance (the angle estimate of
    /// Charikar, STOC 2002), chosen by exact dot product: popcounts stand in for most of the float dot products
    /// of a build. Queries use the same rule, so a query token meets the list of an equal page vector.
    /// </summary>
    public const int Shortlist = 16;

    private readonly int dimensions;
    private readonly int words;
    private readonly float[] centroids;
    private readonly ulong[] centroidCodes;

    // Every page's sign codes, page by page; a vector's position is its row there.
    private readonly PageCodes pages;

    // Per vector position, in step with the page codes' rows: centroid, slot.
    private ushort[] vectorCentroid = [];
    private int[] vectorSlot = [];

    // Per centroid, the positions of its vectors: the inverted lists.
    private List<int>[] lists;

    private CentroidLists(int dimensions, float[] centroids, PageCodes pages)
    {
        this.dimensions = dimensions;
        this.centroids = centroids;
        this.pages = pages;
        words = SignCodes.WordsPerCode(dimensions);
        centroidCodes = new ulong[CentroidCount * words];
        SignCodes.Compute(centroids, dimensions, centroidCodes);
        lists = NewLists(CentroidCount);
    }

    public int CentroidCount => centroids.Length / dimensions;

    public int Count => pages.Count;

    /// <summary>The pages' sign codes the lists point into: a view of every page scores them directly.</summary>
    public PageCodes Pages => pages;

    /// <summary>Centroids, row-major, <c>CentroidCount × dimensions</c>.</summary>
    public ReadOnlySpan<float> Centroids => centroids;

    /// <summary>
    /// Bytes held: centroids, the page codes, per vector its centroid and slot (page-major) and its list entry.
    /// </summary>
    public long BytesEstimate =>
        (centroids.Length * 4L) + pages.BytesEstimate + (vectorCentroid.Length * 2L) + (vectorSlot.Length * 4L)
        + lists.Sum(l => (long)l.Capacity * 4);

    /// <summary>
    /// Centroids for an index of <paramref name="vectors"/> vectors: a power of two near √vectors, within
    /// [<see cref="MinimumCentroids"/>, <see cref="MaximumCentroids"/>]. PLAID takes 16·√vectors; here the lists
    /// are scanned by sign codes, so longer lists cost little, and 1,024 kept as much of the top-10 as 4,096 at
    /// 10,000 pages for a fifth of the build (docs/benchmarks.md, <c>serving</c>).
    /// </summary>
    public static int CentroidsFor(long vectors)
    {
        var wanted = Math.Sqrt(Math.Max(1, vectors));
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

        var lists = new CentroidLists(dimensions, centroids, new PageCodes(dimensions));
        var assigned = new int[rows];
        var sampleCodes = new ulong[rows * lists.words];
        SignCodes.Compute(sample, dimensions, sampleCodes);
        for (var iteration = 0; iteration < Iterations; iteration++)
        {
            // Each iteration assigns by the rule of the lists (sign-code shortlist, then dot product).
            SignCodes.Compute(centroids, dimensions, lists.centroidCodes);
            Parallel.For(
                0,
                rows,
                new ParallelOptions { CancellationToken = cancellationToken },
                () => new Shortlisted(Shortlist),
                (r, _, shortlist) =>
                {
                    assigned[r] = lists.Assigned(sample.AsSpan(r * dimensions, dimensions), sampleCodes.AsSpan(r * lists.words, lists.words), shortlist);
                    return shortlist;
                },
                _ => { });
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

    /// <summary>
    /// Lists over stored centroids and page codes as the serving view file keeps them: per vector (in the page codes'
    /// row order) its centroid. The lists are made again from the centroids of the vectors, one pass.
    /// </summary>
    /// <exception cref="FormatException">The parts do not fit together.</exception>
    public static CentroidLists Restore(float[] centroids, PageCodes pages, ushort[] centroidOfVector)
    {
        ArgumentNullException.ThrowIfNull(pages);
        ArgumentNullException.ThrowIfNull(centroidOfVector);
        var dimensions = pages.Dimensions;
        var restored = new CentroidLists(dimensions, centroids, pages);
        if (pages.Rows != centroidOfVector.Length)
        {
            throw new FormatException($"The pages of the centroid lists have {pages.Rows} vectors, {centroidOfVector.Length} centroids are stored.");
        }

        if (centroidOfVector.Any(c => c >= restored.CentroidCount))
        {
            throw new FormatException($"A vector names a centroid past the {restored.CentroidCount} stored.");
        }

        restored.vectorCentroid = centroidOfVector;
        restored.vectorSlot = new int[centroidOfVector.Length];
        for (var slot = 0; slot < pages.Slots; slot++)
        {
            restored.vectorSlot.AsSpan(pages.StartOf(slot), pages.RowsOf(slot)).Fill(slot);
        }

        restored.RebuildLists();
        return restored;
    }

    /// <summary>Pages in slot order (removed ones included until compaction; <see cref="IsLive"/> tells).</summary>
    public int Slots => pages.Slots;

    public bool IsLive(int slot) => pages.IsLive(slot);

    public ulong IdOf(int slot) => pages.IdOf(slot);

    /// <summary>The centroid of each vector of the page in <paramref name="slot"/>.</summary>
    public ReadOnlySpan<ushort> CentroidsOf(int slot) => vectorCentroid.AsSpan(pages.StartOf(slot), pages.RowsOf(slot));

    /// <summary>The sign codes of the page in <paramref name="slot"/>, words per code each.</summary>
    public ReadOnlySpan<ulong> CodesOf(int slot) => pages.CodesOf(slot);

    /// <summary>True when the page is in the lists.</summary>
    public bool Contains(ulong id) => pages.Contains(id);

    /// <summary>The centroid of each of a page's vectors (given with their sign codes).</summary>
    public ushort[] Assign(ReadOnlySpan<Half> vectors, ReadOnlySpan<ulong> signCodes)
    {
        var rows = vectors.Length / dimensions;
        var row = new float[dimensions];
        var shortlist = new Shortlisted(Shortlist);
        var assigned = new ushort[rows];
        for (var r = 0; r < rows; r++)
        {
            TensorPrimitives.ConvertToSingle(vectors.Slice(r * dimensions, dimensions), row);
            assigned[r] = (ushort)Assigned(row, signCodes.Slice(r * words, words), shortlist);
        }

        return assigned;
    }

    /// <summary>Puts each vector of a page (its centroid from <see cref="Assign"/> and its sign code) in its list.</summary>
    public void Add(ulong id, ushort[] assigned, ReadOnlySpan<ulong> signCodes)
    {
        ArgumentNullException.ThrowIfNull(assigned);
        Remove(id);
        var first = pages.Rows;
        var slot = pages.Add(id, signCodes, assigned.Length);
        Reserve();
        assigned.CopyTo(vectorCentroid.AsSpan(first));
        vectorSlot.AsSpan(first, assigned.Length).Fill(slot);
        for (var r = 0; r < assigned.Length; r++)
        {
            lists[assigned[r]].Add(first + r);
        }
    }

    public void Remove(ulong id)
    {
        if (!pages.Contains(id))
        {
            return;
        }

        pages.Remove(id);
        if (pages.CompactionDue)
        {
            Compact();
        }
    }

    /// <summary>
    /// Ids of the <paramref name="count"/> pages with the best Hamming MaxSim over all their vectors' sign codes, among
    /// the <paramref name="handedOn"/> pages the lists rank best (<see cref="ListRanked"/>): PLAID's later stage that
    /// scores whole candidate pages from their stored codes, here the sign codes kept page by page. When reading the
    /// probed lists would cost more than reading every page's codes in order (<see cref="ListEntryCost"/>), or every
    /// page is handed on, every live page is scored and the lists are not read. Best first, ties to the better list
    /// rank (to the earlier slot when every page is scored).
    /// </summary>
    /// <param name="listEntryCost">What a list entry costs in page-code rows read in order (tests set it to force a path).</param>
    public ulong[] Nearest(ReadOnlySpan<float> query, int probes, int handedOn, int count, CancellationToken cancellationToken, int listEntryCost = ListEntryCost)
    {
        var tokens = query.Length / dimensions;
        var queryCodes = new ulong[tokens * words];
        SignCodes.Compute(query, dimensions, queryCodes);
        var probed = Probed(query, queryCodes, probes);
        var listed = ReadsLists(probed, handedOn, listEntryCost) ? ListScored(queryCodes, probed, handedOn, cancellationToken) : null;
        return pages.Best(queryCodes, count, listed, null, cancellationToken);
    }

    /// <summary>
    /// A list entry read costs about this many page-code rows read in order: the entries point at codes spread over
    /// the whole index (a cache miss each), the rows of every page lie side by side. At 10,000 pages about 70 ns an
    /// entry against 7 ns a row (10); at 100,000 pages (208 MB of codes, an entry misses every cache level) the
    /// probed lists held 5.9 % of the vectors at the median query and, with their 25,000 pages' codes, took 200 ms
    /// against 94.5 ms for every page's codes: about 230 ns an entry against 7.3 ns a row, 31 rows
    /// (docs/benchmarks.md, <c>serving</c>, sixth run).
    /// </summary>
    public const int ListEntryCost = 32;

    /// <summary>The entries of the lists the query's tokens probe (each list counted once), as the cost rule sums them.</summary>
    public long ProbedEntries(ReadOnlySpan<float> query, int probes)
    {
        var queryCodes = new ulong[query.Length / dimensions * words];
        SignCodes.Compute(query, dimensions, queryCodes);
        return EntriesOf(Probed(query, queryCodes, probes));
    }

    /// <summary>Vectors of the live pages.</summary>
    public long LiveVectors => pages.LiveRows;

    /// <summary>
    /// True when the probed lists and the page codes of the <paramref name="handedOn"/> pages cost less to read than
    /// the codes of every page: lists of common content (or of a centroid that gathered the rare tail) can hold a
    /// large share of the index.
    /// </summary>
    private bool ReadsLists(HashSet<int>[] probed, int handedOn, int listEntryCost)
    {
        if (handedOn >= Count)
        {
            return false;
        }

        var entries = EntriesOf(probed);
        var live = LiveVectors;
        return (entries * listEntryCost) + (live * handedOn / Count) < live;
    }

    // The entries of the probed lists, each list counted once (tokens may share a centroid).
    private long EntriesOf(HashSet<int>[] probed) => probed.SelectMany(p => p).Distinct().Sum(c => (long)lists[c].Count);

    /// <summary>
    /// Per query token the centroids whose lists it reads: the one its vector would be assigned to and the nearest
    /// others by dot product, <paramref name="probes"/> in all.
    /// </summary>
    private HashSet<int>[] Probed(ReadOnlySpan<float> query, ulong[] queryCodes, int probes)
    {
        var tokens = query.Length / dimensions;
        var centroidCount = CentroidCount;
        probes = Math.Clamp(probes, 1, centroidCount);
        var shortlist = new Shortlisted(Shortlist);
        var scores = new float[centroidCount];
        var order = new int[centroidCount];
        var probed = new HashSet<int>[tokens];
        for (var q = 0; q < tokens; q++)
        {
            var token = query.Slice(q * dimensions, dimensions);
            probed[q] = [Assigned(token, queryCodes.AsSpan(q * words, words), shortlist)];
            if (probes > 1)
            {
                for (var c = 0; c < centroidCount; c++)
                {
                    scores[c] = -TensorPrimitives.Dot(token, centroids.AsSpan(c * dimensions, dimensions));
                    order[c] = c;
                }

                Array.Sort(scores, order);
                for (var i = 0; probed[q].Count < probes; i++)
                {
                    probed[q].Add(order[i]);
                }
            }
        }

        return probed;
    }

    /// <summary>
    /// Ids of the <paramref name="count"/> pages with the best approximate MaxSim from the lists each query token
    /// (rows of <paramref name="query"/>) probes: the centroid its vector would be assigned to and the nearest
    /// others by dot product, <paramref name="probes"/> in all. Best first, ties to the earlier slot.
    /// </summary>
    public ulong[] ListRanked(ReadOnlySpan<float> query, int probes, int count, CancellationToken cancellationToken)
    {
        var queryCodes = new ulong[query.Length / dimensions * words];
        SignCodes.Compute(query, dimensions, queryCodes);
        return [.. ListScored(queryCodes, Probed(query, queryCodes, probes), count, cancellationToken).Select(pages.IdOf)];
    }

    /// <summary>
    /// Slots of the <paramref name="count"/> best pages by the lists: per token the best entry of the probed lists
    /// counts (the sign codes' dot product); a token that found nothing on a page is imputed the lowest score it
    /// saw (WARP's imputation of missing similarities). Pages are counted in arrays indexed by slot, not a map: the
    /// lists of common content run to a large share of the index, and a map lookup per entry made this stage the
    /// slowest of a query (docs/benchmarks.md, <c>serving</c>, fifth run).
    /// </summary>
    private int[] ListScored(ulong[] queryCodes, HashSet<int>[] probed, int count, CancellationToken cancellationToken)
    {
        var tokens = probed.Length;
        var slots = pages.Slots;
        var codes = pages.AllCodes;

        // Per slot: the sum over the tokens that found it of (its best − the token's imputed score), the best of the
        // current token, and the last token (1-based) that found it. The total is that sum plus every token's imputed score.
        var gain = ArrayPool<int>.Shared.Rent(slots);
        var tokenBest = ArrayPool<int>.Shared.Rent(slots);
        var foundBy = ArrayPool<int>.Shared.Rent(slots);
        try
        {
            foundBy.AsSpan(0, slots).Clear();
            var touched = new List<int>();
            var touchedByToken = new List<int>();
            long imputedSum = 0;
            for (var q = 0; q < tokens; q++)
            {
                cancellationToken.ThrowIfCancellationRequested();
                var tokenCode = queryCodes.AsSpan(q * words, words);
                var lowest = int.MaxValue;
                var stamp = q + 1;
                touchedByToken.Clear();
                foreach (var c in probed[q])
                {
                    foreach (var position in CollectionsMarshal.AsSpan(lists[c]))
                    {
                        var slot = vectorSlot[position];
                        if (!pages.IsLive(slot))
                        {
                            continue;
                        }

                        var similarity = dimensions - (2 * Distance(tokenCode, codes, position));
                        lowest = Math.Min(lowest, similarity);
                        if (foundBy[slot] == stamp)
                        {
                            tokenBest[slot] = Math.Max(tokenBest[slot], similarity);
                            continue;
                        }

                        if (foundBy[slot] == 0)
                        {
                            gain[slot] = 0;
                            touched.Add(slot);
                        }

                        foundBy[slot] = stamp;
                        tokenBest[slot] = similarity;
                        touchedByToken.Add(slot);
                    }
                }

                var imputed = lowest == int.MaxValue ? 0 : lowest;
                imputedSum += imputed;
                foreach (var slot in touchedByToken)
                {
                    gain[slot] += tokenBest[slot] - imputed;
                }
            }

            var top = new TopScores(count);
            foreach (var slot in touched)
            {
                top.Offer(gain[slot] + imputedSum, slot);
            }

            return [.. top.ToSorted().Select(s => s.Ordinal)];
        }
        finally
        {
            ArrayPool<int>.Shared.Return(gain);
            ArrayPool<int>.Shared.Return(tokenBest);
            ArrayPool<int>.Shared.Return(foundBy);
        }
    }

    /// <summary>Differing bits between a query token's code and the stored code at <paramref name="position"/>.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private int Distance(ReadOnlySpan<ulong> tokenCode, ulong[] codes, int position)
    {
        if (words == 2)
        {
            // The default d = 128: two words, no loop.
            return BitOperations.PopCount(tokenCode[0] ^ codes[2 * position]) + BitOperations.PopCount(tokenCode[1] ^ codes[(2 * position) + 1]);
        }

        var distance = 0;
        for (var w = 0; w < words; w++)
        {
            distance += BitOperations.PopCount(tokenCode[w] ^ codes[(position * words) + w]);
        }

        return distance;
    }

    /// <summary>The centroid of <see cref="Shortlist"/> by fewest differing sign bits (ties: lower id) with the largest dot product.</summary>
    private int Assigned(ReadOnlySpan<float> row, ReadOnlySpan<ulong> code, Shortlisted shortlist)
    {
        var words = code.Length;
        shortlist.Clear();
        if (words == 2)
        {
            // The default d = 128: both words in registers.
            var (low, high) = (code[0], code[1]);
            for (var c = 0; c < CentroidCount; c++)
            {
                shortlist.Offer(BitOperations.PopCount(low ^ centroidCodes[2 * c]) + BitOperations.PopCount(high ^ centroidCodes[(2 * c) + 1]), c);
            }
        }
        else
        {
            for (var c = 0; c < CentroidCount; c++)
            {
                var distance = 0;
                for (var w = 0; w < words; w++)
                {
                    distance += BitOperations.PopCount(code[w] ^ centroidCodes[(c * words) + w]);
                }

                shortlist.Offer(distance, c);
            }
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

    /// <summary>Drops the tombstones: live pages' vectors moved down in their order (centroids and slots with them), the lists made again.</summary>
    private void Compact()
    {
        pages.Compact((from, to, length, slot) =>
        {
            vectorCentroid.AsSpan(from, length).CopyTo(vectorCentroid.AsSpan(to));
            vectorSlot.AsSpan(to, length).Fill(slot);
        });
        RebuildLists();
    }

    /// <summary>The lists from the vectors' centroids, positions ascending in each (counted first, so sized exactly).</summary>
    private void RebuildLists()
    {
        var sizes = new int[CentroidCount];
        for (var position = 0; position < pages.Rows; position++)
        {
            sizes[vectorCentroid[position]]++;
        }

        lists = [.. sizes.Select(size => new List<int>(size))];
        for (var position = 0; position < pages.Rows; position++)
        {
            lists[vectorCentroid[position]].Add(position);
        }
    }

    /// <summary>The per-vector arrays as long as the page codes' room.</summary>
    private void Reserve()
    {
        if (vectorCentroid.Length < pages.Capacity)
        {
            Array.Resize(ref vectorCentroid, pages.Capacity);
            Array.Resize(ref vectorSlot, pages.Capacity);
        }
    }

    private static List<int>[] NewLists(int count) => [.. Enumerable.Range(0, count).Select(_ => new List<int>())];
}
