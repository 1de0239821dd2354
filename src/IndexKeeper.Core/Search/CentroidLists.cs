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
    private readonly Dictionary<ulong, int> slotOf = [];

    // Per slot (a page as added; removed ones are dead until compaction): id, first vector position, vector count.
    private List<ulong> idOf = [];
    private List<bool> alive = [];
    private List<int> startOf = [];
    private List<int> rowsOf = [];

    // Per vector position, pages' vectors kept together (page-major): sign code, centroid, slot.
    private ulong[] vectorCodes = [];
    private ushort[] vectorCentroid = [];
    private int[] vectorSlot = [];
    private int vectorCount;

    // Per centroid, the positions of its vectors: the inverted lists.
    private List<int>[] lists;
    private int dead;

    private CentroidLists(int dimensions, float[] centroids)
    {
        this.dimensions = dimensions;
        this.centroids = centroids;
        words = SignCodes.WordsPerCode(dimensions);
        centroidCodes = new ulong[CentroidCount * words];
        SignCodes.Compute(centroids, dimensions, centroidCodes);
        lists = NewLists(CentroidCount);
    }

    public int CentroidCount => centroids.Length / dimensions;

    public int Count => slotOf.Count;

    /// <summary>Centroids, row-major, <c>CentroidCount × dimensions</c>.</summary>
    public ReadOnlySpan<float> Centroids => centroids;

    /// <summary>
    /// Bytes held: centroids, per vector its sign code, centroid and slot (page-major) and its list entry, per page
    /// its slot fields.
    /// </summary>
    public long BytesEstimate =>
        (centroids.Length * 4L) + (vectorCodes.Length * 8L) + (vectorCentroid.Length * 2L) + (vectorSlot.Length * 4L)
        + lists.Sum(l => (long)l.Capacity * 4) + (idOf.Capacity * 17L) + (slotOf.Count * 24L);

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

        var lists = new CentroidLists(dimensions, centroids);
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
    /// Lists over stored centroids and pages as the serving view file keeps them: per page its id and vector count
    /// (in slot order), per vector (pages' vectors together, in the same order) its centroid and sign code. The
    /// lists are made again from the centroids of the vectors, one pass.
    /// </summary>
    /// <exception cref="FormatException">The parts do not fit together.</exception>
    public static CentroidLists Restore(int dimensions, float[] centroids, ulong[] ids, int[] rows, ushort[] centroidOfVector, ulong[] codes)
    {
        ArgumentNullException.ThrowIfNull(ids);
        ArgumentNullException.ThrowIfNull(rows);
        ArgumentNullException.ThrowIfNull(centroidOfVector);
        ArgumentNullException.ThrowIfNull(codes);
        var restored = new CentroidLists(dimensions, centroids);
        if (ids.Length != rows.Length || codes.Length != (long)centroidOfVector.Length * restored.words)
        {
            throw new FormatException($"{ids.Length} pages with {rows.Length} vector counts, {centroidOfVector.Length} vectors with {codes.Length} code words.");
        }

        restored.vectorCodes = codes;
        restored.vectorCentroid = centroidOfVector;
        restored.vectorSlot = new int[centroidOfVector.Length];
        restored.idOf = new List<ulong>(ids.Length);
        restored.alive = new List<bool>(ids.Length);
        restored.startOf = new List<int>(ids.Length);
        restored.rowsOf = new List<int>(ids.Length);
        long at = 0;
        for (var slot = 0; slot < ids.Length; slot++)
        {
            if (rows[slot] < 0 || at + rows[slot] > centroidOfVector.Length || !restored.slotOf.TryAdd(ids[slot], slot))
            {
                throw new FormatException($"Page {ids[slot]} of the centroid lists has {rows[slot]} vectors past the stored ones, or is there twice.");
            }

            restored.idOf.Add(ids[slot]);
            restored.alive.Add(true);
            restored.startOf.Add((int)at);
            restored.rowsOf.Add(rows[slot]);
            restored.vectorSlot.AsSpan((int)at, rows[slot]).Fill(slot);
            at += rows[slot];
        }

        if (at != centroidOfVector.Length)
        {
            throw new FormatException($"The pages of the centroid lists have {at} vectors, {centroidOfVector.Length} are stored.");
        }

        restored.vectorCount = (int)at;
        if (centroidOfVector.Any(c => c >= restored.CentroidCount))
        {
            throw new FormatException($"A vector names a centroid past the {restored.CentroidCount} stored.");
        }

        restored.RebuildLists();
        return restored;
    }

    /// <summary>Pages in slot order (removed ones included until compaction; <see cref="IsLive"/> tells).</summary>
    public int Slots => idOf.Count;

    public bool IsLive(int slot) => alive[slot];

    public ulong IdOf(int slot) => idOf[slot];

    /// <summary>The centroid of each vector of the page in <paramref name="slot"/>.</summary>
    public ReadOnlySpan<ushort> CentroidsOf(int slot) => vectorCentroid.AsSpan(startOf[slot], rowsOf[slot]);

    /// <summary>The sign codes of the page in <paramref name="slot"/>, words per code each.</summary>
    public ReadOnlySpan<ulong> CodesOf(int slot) => vectorCodes.AsSpan(startOf[slot] * words, rowsOf[slot] * words);

    /// <summary>True when the page is in the lists.</summary>
    public bool Contains(ulong id) => slotOf.ContainsKey(id);

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
        var slot = idOf.Count;
        idOf.Add(id);
        alive.Add(true);
        startOf.Add(vectorCount);
        rowsOf.Add(assigned.Length);
        slotOf[id] = slot;
        Reserve(vectorCount + assigned.Length);
        signCodes[..(assigned.Length * words)].CopyTo(vectorCodes.AsSpan(vectorCount * words));
        assigned.CopyTo(vectorCentroid.AsSpan(vectorCount));
        for (var r = 0; r < assigned.Length; r++)
        {
            vectorSlot[vectorCount] = slot;
            lists[assigned[r]].Add(vectorCount++);
        }
    }

    public void Remove(ulong id)
    {
        if (!slotOf.Remove(id, out var slot))
        {
            return;
        }

        alive[slot] = false;
        if (++dead > Math.Max(1024, idOf.Count / 4))
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
        var listed = ReadsLists(probed, handedOn, listEntryCost)
            ? ListScored(queryCodes, probed, handedOn, cancellationToken)
            : [.. Enumerable.Range(0, Slots).Where(IsLive)];
        var ordinals = Enumerable.Range(0, listed.Length).ToArray();
        var top = LateInteractionSearch.Scan(ordinals, count, Environment.ProcessorCount, cancellationToken, () => new int[tokens], static _ => { }, (ordinal, closest, best) =>
        {
            var slot = listed[ordinal];
            best.Offer(MaxSimKernels.Hamming(queryCodes, vectorCodes.AsSpan(startOf[slot] * words, rowsOf[slot] * words), dimensions, closest), ordinal);
        });
        return [.. top.Select(t => idOf[listed[t.Ordinal]])];
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
    public long LiveVectors => (long)vectorCount * Count / Math.Max(1, Slots);

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
        return [.. ListScored(queryCodes, Probed(query, queryCodes, probes), count, cancellationToken).Select(s => idOf[s])];
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
        var slots = idOf.Count;

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
                        if (!alive[slot])
                        {
                            continue;
                        }

                        var similarity = dimensions - (2 * Distance(tokenCode, position));
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
    private int Distance(ReadOnlySpan<ulong> tokenCode, int position)
    {
        if (words == 2)
        {
            // The default d = 128: two words, no loop.
            return BitOperations.PopCount(tokenCode[0] ^ vectorCodes[2 * position]) + BitOperations.PopCount(tokenCode[1] ^ vectorCodes[(2 * position) + 1]);
        }

        var distance = 0;
        for (var w = 0; w < words; w++)
        {
            distance += BitOperations.PopCount(tokenCode[w] ^ vectorCodes[(position * words) + w]);
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

    /// <summary>Drops the tombstones: live slots and their vectors moved down in their order, the lists made again.</summary>
    private void Compact()
    {
        var ids = new List<ulong>(slotOf.Count);
        var starts = new List<int>(slotOf.Count);
        var rows = new List<int>(slotOf.Count);
        var kept = 0;
        for (var slot = 0; slot < idOf.Count; slot++)
        {
            if (!alive[slot])
            {
                continue;
            }

            var (from, length) = (startOf[slot], rowsOf[slot]);
            vectorCodes.AsSpan(from * words, length * words).CopyTo(vectorCodes.AsSpan(kept * words));
            vectorCentroid.AsSpan(from, length).CopyTo(vectorCentroid.AsSpan(kept));
            vectorSlot.AsSpan(kept, length).Fill(ids.Count);
            slotOf[idOf[slot]] = ids.Count;
            ids.Add(idOf[slot]);
            starts.Add(kept);
            rows.Add(length);
            kept += length;
        }

        idOf = ids;
        startOf = starts;
        rowsOf = rows;
        alive = [.. ids.Select(_ => true)];
        vectorCount = kept;
        dead = 0;
        RebuildLists();
    }

    /// <summary>The lists from the vectors' centroids, positions ascending in each (counted first, so sized exactly).</summary>
    private void RebuildLists()
    {
        var sizes = new int[CentroidCount];
        for (var position = 0; position < vectorCount; position++)
        {
            sizes[vectorCentroid[position]]++;
        }

        lists = [.. sizes.Select(size => new List<int>(size))];
        for (var position = 0; position < vectorCount; position++)
        {
            lists[vectorCentroid[position]].Add(position);
        }
    }

    /// <summary>Room for <paramref name="vectors"/> vectors in the page-major arrays, grown by half again.</summary>
    private void Reserve(int vectors)
    {
        if (vectors <= vectorCentroid.Length)
        {
            return;
        }

        var capacity = Math.Max(vectors, Math.Max(1024, vectorCentroid.Length + (vectorCentroid.Length / 2)));
        Array.Resize(ref vectorCodes, capacity * words);
        Array.Resize(ref vectorCentroid, capacity);
        Array.Resize(ref vectorSlot, capacity);
    }

    private static List<int>[] NewLists(int count) => [.. Enumerable.Range(0, count).Select(_ => new List<int>())];
}
