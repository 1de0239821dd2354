using System.Numerics;
using System.Numerics.Tensors;

namespace IndexKeeper.Core.Search;

/// <summary>
/// Candidate pages from centroid inverted lists of vectors, after Santhanam, Khattab, Potts and Zaharia, "PLAID:
/// An Efficient Engine for Late Interaction Retrieval" (CIKM 2022, arXiv:2205.09707) and Scheerer et al., "WARP:
/// An Efficient Engine for Multi-Vector Retrieval" (SIGIR 2025, arXiv:2501.17788): k-means centroids trained on a
/// sample of the index's vectors; every stored vector is an entry (page, sign code) in the list of its centroid.
/// A query token probes a few centroids and scores the entries of their lists by the sign codes' dot product
/// (the stand-in for PLAID's residuals); per page and token the best entry counts, and a token that found nothing
/// on a page is imputed the lowest score it saw (WARP's imputation of missing similarities). The pages with the
/// best sums are the candidates of the exact stages (docs/search.md, "Candidates"; docs/benchmarks.md, <c>serving</c>).
/// </summary>
/// <remarks>
/// Adds are assigned to the trained centroids and appended; removes leave a tombstone until a quarter of the
/// slots are dead, then the lists are compacted. The centroids do not follow the content: their quality under
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
    private List<ulong> idOf = [];
    private List<bool> alive = [];
    private List<int>[] slots;
    private List<ulong>[] codes;
    private int dead;

    private CentroidLists(int dimensions, float[] centroids)
    {
        this.dimensions = dimensions;
        this.centroids = centroids;
        words = SignCodes.WordsPerCode(dimensions);
        centroidCodes = new ulong[CentroidCount * words];
        SignCodes.Compute(centroids, dimensions, centroidCodes);
        slots = [.. Enumerable.Range(0, CentroidCount).Select(_ => new List<int>())];
        codes = [.. Enumerable.Range(0, CentroidCount).Select(_ => new List<ulong>())];
    }

    public int CentroidCount => centroids.Length / dimensions;

    public int Count => slotOf.Count;

    /// <summary>Centroids, row-major, <c>CentroidCount × dimensions</c>.</summary>
    public ReadOnlySpan<float> Centroids => centroids;

    /// <summary>Bytes held: centroids, list entries (a 4-byte slot and the sign code each) and per-page slots.</summary>
    public long BytesEstimate => (centroids.Length * 4L) + slots.Sum(l => (long)l.Capacity * 4) + codes.Sum(l => (long)l.Capacity * 8) + (idOf.Capacity * 9L) + (slotOf.Count * 24L);

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

    /// <summary>Lists over stored centroids and list entries (page id and sign code), as the serving view file keeps them.</summary>
    public static CentroidLists Restore(int dimensions, float[] centroids, IReadOnlyList<(ulong[] Ids, ulong[] Codes)> lists)
    {
        ArgumentNullException.ThrowIfNull(lists);
        var restored = new CentroidLists(dimensions, centroids);
        if (lists.Count != restored.CentroidCount)
        {
            throw new FormatException($"{lists.Count} centroid lists for {restored.CentroidCount} centroids.");
        }

        // Slots in ascending id order, as adds made them (the view never reuses an id), so ties break as before.
        foreach (var id in lists.SelectMany(l => l.Ids).Distinct().Order())
        {
            restored.slotOf[id] = restored.idOf.Count;
            restored.idOf.Add(id);
            restored.alive.Add(true);
        }

        for (var c = 0; c < lists.Count; c++)
        {
            var (ids, entryCodes) = lists[c];
            if (entryCodes.Length != ids.Length * restored.words)
            {
                throw new FormatException($"Centroid list {c} has {ids.Length} entries and {entryCodes.Length} code words.");
            }

            restored.slots[c].AddRange(ids.Select(id => restored.slotOf[id]));
            restored.codes[c].AddRange(entryCodes);
        }

        return restored;
    }

    /// <summary>The live entries of list <paramref name="centroid"/>: page ids and their sign codes (words per code each).</summary>
    public (ulong[] Ids, ulong[] Codes) List(int centroid)
    {
        var ids = new List<ulong>();
        var entryCodes = new List<ulong>();
        for (var e = 0; e < slots[centroid].Count; e++)
        {
            var slot = slots[centroid][e];
            if (alive[slot])
            {
                ids.Add(idOf[slot]);
                entryCodes.AddRange(codes[centroid].GetRange(e * words, words));
            }
        }

        return ([.. ids], [.. entryCodes]);
    }

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
        slotOf[id] = slot;
        for (var r = 0; r < assigned.Length; r++)
        {
            slots[assigned[r]].Add(slot);
            foreach (var word in signCodes.Slice(r * words, words))
            {
                codes[assigned[r]].Add(word);
            }
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
    /// Ids of the <paramref name="count"/> pages with the best approximate MaxSim from the lists each query token
    /// (rows of <paramref name="query"/>) probes: the centroid its vector would be assigned to and the nearest
    /// others by dot product, <paramref name="probes"/> in all. Best first, ties to the earlier slot.
    /// </summary>
    public ulong[] Nearest(ReadOnlySpan<float> query, int probes, int count, CancellationToken cancellationToken)
    {
        var tokens = query.Length / dimensions;
        var centroidCount = CentroidCount;
        probes = Math.Clamp(probes, 1, centroidCount);
        var queryCodes = new ulong[tokens * words];
        SignCodes.Compute(query, dimensions, queryCodes);
        var shortlist = new Shortlisted(Shortlist);
        var scores = new float[centroidCount];
        var order = new int[centroidCount];
        var rowOf = new Dictionary<int, int>();
        var best = new List<int>();
        var imputed = new int[tokens];
        for (var q = 0; q < tokens; q++)
        {
            cancellationToken.ThrowIfCancellationRequested();
            var token = query.Slice(q * dimensions, dimensions);
            var tokenCode = queryCodes.AsSpan(q * words, words);
            var probed = new HashSet<int> { Assigned(token, tokenCode, shortlist) };
            if (probes > 1)
            {
                for (var c = 0; c < centroidCount; c++)
                {
                    scores[c] = -TensorPrimitives.Dot(token, centroids.AsSpan(c * dimensions, dimensions));
                    order[c] = c;
                }

                Array.Sort(scores, order);
                for (var i = 0; probed.Count < probes; i++)
                {
                    probed.Add(order[i]);
                }
            }

            var lowest = int.MaxValue;
            foreach (var c in probed)
            {
                var listSlots = slots[c];
                var listCodes = codes[c];
                for (var e = 0; e < listSlots.Count; e++)
                {
                    var slot = listSlots[e];
                    if (!alive[slot])
                    {
                        continue;
                    }

                    var distance = 0;
                    for (var w = 0; w < words; w++)
                    {
                        distance += BitOperations.PopCount(tokenCode[w] ^ listCodes[(e * words) + w]);
                    }

                    var similarity = dimensions - (2 * distance);
                    lowest = Math.Min(lowest, similarity);
                    if (!rowOf.TryGetValue(slot, out var row))
                    {
                        row = rowOf.Count;
                        rowOf[slot] = row;
                        for (var t = 0; t < tokens; t++)
                        {
                            best.Add(int.MinValue);
                        }
                    }

                    var at = (row * tokens) + q;
                    best[at] = Math.Max(best[at], similarity);
                }
            }

            imputed[q] = lowest == int.MaxValue ? 0 : lowest;
        }

        var top = new TopScores(count);
        foreach (var (slot, row) in rowOf)
        {
            var total = 0;
            for (var q = 0; q < tokens; q++)
            {
                var found = best[(row * tokens) + q];
                total += found == int.MinValue ? imputed[q] : found;
            }

            top.Offer(total, slot);
        }

        return [.. top.ToSorted().Select(s => idOf[s.Ordinal])];
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

    /// <summary>Drops the tombstones: live slots renumbered in their order, each list filtered.</summary>
    private void Compact()
    {
        var renumbered = new int[idOf.Count];
        var ids = new List<ulong>(slotOf.Count);
        for (var slot = 0; slot < idOf.Count; slot++)
        {
            renumbered[slot] = alive[slot] ? ids.Count : -1;
            if (alive[slot])
            {
                slotOf[idOf[slot]] = ids.Count;
                ids.Add(idOf[slot]);
            }
        }

        for (var c = 0; c < CentroidCount; c++)
        {
            var keptSlots = new List<int>();
            var keptCodes = new List<ulong>();
            for (var e = 0; e < slots[c].Count; e++)
            {
                if (renumbered[slots[c][e]] is var slot and >= 0)
                {
                    keptSlots.Add(slot);
                    keptCodes.AddRange(codes[c].GetRange(e * words, words));
                }
            }

            slots[c] = keptSlots;
            codes[c] = keptCodes;
        }

        idOf = ids;
        alive = [.. ids.Select(_ => true)];
        dead = 0;
    }
}
