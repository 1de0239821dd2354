using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Core.Search;

/// <summary>
/// What search needs of one encoder's live pages, kept between queries (docs/search.md, "Serving view"): the
/// page directory (page key → record location) and the structure of its <see cref="Source"/>: every page's sign
/// codes for <c>All</c>, the candidate graph of the pages' fixed dimensional encodings, or the centroid lists (which
/// hold the page codes too). It
/// reflects one catalog vector-set generation and moves forward by <see cref="Apply"/>, one
/// commit's changes at a time; <see cref="ServingViewFile"/> keeps it on disk for the next process.
/// </summary>
/// <remarks>
/// Locking: <c>gate</c> guards the directory, the graph and the centroid lists. Searches hold it shared to find
/// candidates (alone for the graph, whose package is not known to search safely beside itself), and so does
/// <see cref="Write"/>: a search never waits for the view's writing to disk. <see cref="Apply"/> encodes pages (and
/// trains centroids) outside it and holds it alone only to insert. REQUIRES: one caller of <see cref="Apply"/> at a
/// time (the writer).
/// </remarks>
public sealed class ServingView : IDisposable
{
    private readonly ViewGate gate = new();
    private readonly Dictionary<PageKey, Slot> byKey = [];
    private readonly Dictionary<ulong, PageKey> byId = [];
    private FixedDimensionalEncoding? encoding;
    private CandidateGraph? graph;
    private CentroidLists? centroids;

    // The sign codes of every page for All (the centroid lists' own when the view was read from a file of them).
    private PageCodes? pageCodes;
    private ulong nextId = 1;

    // Running counts for AddedShareSinceTraining: every live vector, and those of pages with ids from the training on.
    private long vectors;
    private long vectorsAddedSinceTraining;
    private ulong firstIdAfterTraining = ulong.MaxValue;

    // Every live page in page-key order, made on first use after a change: a search over all pages asks per query.
    private ServingEntry[]? sorted;

    // Their slots in the page codes, in the same order: scores tied at the cut break by page key, so a view moved
    // forward by commits keeps the pages a view built afresh keeps (slots follow the order pages came in). And the
    // positions in that array by ascending slot, the order that reads the codes front to back.
    private (int[] Slots, int[] Visit)? byKeyOrder;

    /// <param name="expectedVectors">Vectors of the pages the first <see cref="Apply"/> will be followed by (a build
    /// knows them): the centroid count is chosen for them (<see cref="CentroidLists.CentroidsFor"/>); 0 for the
    /// first batch's own count.</param>
    public ServingView(string encoderId, long generation, CandidateSource source, long expectedVectors = 0)
    {
        ArgumentException.ThrowIfNullOrEmpty(encoderId);
        ArgumentOutOfRangeException.ThrowIfNegative(expectedVectors);
        EncoderId = encoderId;
        Generation = generation;
        Source = source;
        ExpectedVectors = expectedVectors;
    }

    public string EncoderId { get; }

    /// <summary>Where searches of this view take candidates from; the view holds that source's structure only.</summary>
    public CandidateSource Source { get; }

    /// <summary>Centroids to train instead of the count chosen for the vectors (measurement only; 0: chosen).</summary>
    internal int CentroidsWanted { get; init; }

    private long ExpectedVectors { get; }

    /// <summary>The catalog vector-set generation this view shows.</summary>
    public long Generation { get; private set; }

    /// <summary>Dimensions of the vectors (0 while the view is empty and has never held a page).</summary>
    public int Dimensions { get; private set; }

    public int Count
    {
        get
        {
            using (gate.Read())
            {
                return byKey.Count;
            }
        }
    }

    /// <summary>Bytes of the candidate graph in memory, estimated as the package lays it out (encoding + links).</summary>
    public long GraphBytesEstimate => graph is null ? 0 : Count * ((FixedDimensionalEncoding.Length * 2L) + (2 * 16 * 4) + 16);

    /// <summary>Bytes of the centroid lists in memory (centroids, codes, list entries).</summary>
    public long CentroidBytesEstimate
    {
        get
        {
            using (gate.Read())
            {
                return centroids?.BytesEstimate ?? 0;
            }
        }
    }

    /// <summary>Bytes of the page codes of <c>All</c> in memory (0 for the other sources: their structure holds its own).</summary>
    public long PageCodeBytesEstimate
    {
        get
        {
            using (gate.Read())
            {
                return Source == CandidateSource.All ? pageCodes?.BytesEstimate ?? 0 : 0;
            }
        }
    }

    /// <summary>Centroids of the lists (0 when the view has none).</summary>
    public int CentroidCount
    {
        get
        {
            using (gate.Read())
            {
                return centroids?.CentroidCount ?? 0;
            }
        }
    }

    /// <summary>The last recall figure of this view's candidates (docs/search.md, "Recall"); null when never measured.</summary>
    public CandidateRecall? Recall { get; private set; }

    /// <summary>Pages added, moved or removed since <see cref="Recall"/> was measured (or since the view was built).</summary>
    public long ChangedSinceRecall { get; private set; }

    /// <summary>Records a recall figure measured on this view; the change count starts again.</summary>
    public void Measured(CandidateRecall recall)
    {
        ArgumentNullException.ThrowIfNull(recall);
        using (gate.Write())
        {
            Recall = recall;
            ChangedSinceRecall = 0;
        }
    }

    /// <summary>When the centroids were trained; null when not known (a view built before they were counted).</summary>
    public DateTimeOffset? TrainedAt { get; private set; }

    /// <summary>
    /// Share of the view's vectors added after its centroids were trained (kept by each change, never recounted);
    /// null when <see cref="TrainedAt"/> is unknown or the view is empty.
    /// </summary>
    public double? AddedShareSinceTraining => Training.AddedShare;

    /// <summary>The running counts behind <see cref="TrainedAt"/> and <see cref="AddedShareSinceTraining"/>, as the view file keeps them.</summary>
    internal TrainingFigures Training
    {
        get
        {
            using (gate.Read())
            {
                return new TrainingFigures(TrainedAt, firstIdAfterTraining, vectors, vectorsAddedSinceTraining);
            }
        }
    }

    /// <summary>Marks the view's pages as those its centroids were trained for: later adds count as added since training.</summary>
    public void MarkTrained(DateTimeOffset at)
    {
        using (gate.Write())
        {
            TrainedAt = at;
            firstIdAfterTraining = nextId;
            vectorsAddedSinceTraining = 0;
        }
    }

    /// <summary>Live pages left out because their vector set could not be read when they were added.</summary>
    public int Unreadable { get; private set; }

    /// <summary>
    /// Moves the view to <paramref name="generation"/>: each change puts, moves or removes a page. New pages are
    /// read through <paramref name="open"/> (a source over the locations given that can be read, and for each of
    /// its ordinals the index of its location) and encoded; one that cannot be read is left out and counted.
    /// </summary>
    public void Apply(
        long generation,
        IReadOnlyList<ServingChange> changes,
        Func<IReadOnlyList<RecordLocation>, (IVectorSetSource Source, IReadOnlyList<int> Given)> open,
        CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(changes);
        ArgumentNullException.ThrowIfNull(open);

        // The last change of a key is its state after the commits; earlier ones are history.
        var last = new Dictionary<PageKey, int>();
        for (var i = 0; i < changes.Count; i++)
        {
            last[changes[i].Key] = i;
        }

        changes = [.. last.Values.Order().Select(i => changes[i])];
        List<ServingChange> added;
        using (gate.Read())
        {
            added = [.. changes.Where(c => c.Location is not null && !byKey.ContainsKey(c.Key))];
        }

        var encodings = new Dictionary<PageKey, float[]>();
        var codes = new Dictionary<PageKey, (ushort[] Assigned, ulong[] SignCodes)>();
        var signCodes = new Dictionary<PageKey, (ulong[] Codes, int Rows)>();
        var readable = new HashSet<PageKey>();
        var dimensions = Dimensions;
        var trained = centroids;
        if (added.Count > 0)
        {
            var (source, given) = open([.. added.Select(a => a.Location!.Value)]);
            try
            {
                for (var i = 0; i < source.Count; i++)
                {
                    var pageDimensions = source.Get(i).Dimensions;
                    if (dimensions == 0)
                    {
                        dimensions = pageDimensions;
                    }
                    else if (pageDimensions != dimensions)
                    {
                        throw new InvalidOperationException($"Vector set {source.Get(i).Key} has {pageDimensions} dimensions, the view {dimensions}: they come from different encoders.");
                    }

                    readable.Add(added[given[i]].Key);
                }

                if (Source == CandidateSource.Graph && source.Count > 0)
                {
                    // Encoding is the cost of a build (every vector times 200 dot products): both cores share it.
                    var encoded = new float[source.Count][];
                    var encoder = encoding ??= new FixedDimensionalEncoding(dimensions);
                    Parallel.For(0, source.Count, new ParallelOptions { CancellationToken = cancellationToken }, i =>
                    {
                        encoded[i] = new float[FixedDimensionalEncoding.Length];
                        encoder.EncodePage(source.Get(i).Vectors, encoded[i]);
                    });
                    for (var i = 0; i < encoded.Length; i++)
                    {
                        encodings[added[given[i]].Key] = encoded[i];
                    }
                }
                else if (Source == CandidateSource.Centroids && source.Count > 0)
                {
                    // The first pages train the centroids (a build hands a sample spread over the index first);
                    // later ones are assigned to them. Assignment is the cost of a build: both cores share it.
                    trained ??= Train(source, dimensions, cancellationToken);
                    var assigned = new (ushort[], ulong[])[source.Count];
                    Parallel.For(0, source.Count, new ParallelOptions { CancellationToken = cancellationToken }, i =>
                    {
                        var page = source.Get(i);
                        assigned[i] = (trained.Assign(page.Vectors, page.SignCodes), page.SignCodes.ToArray());
                    });
                    for (var i = 0; i < assigned.Length; i++)
                    {
                        codes[added[given[i]].Key] = assigned[i];
                    }
                }
                else if (Source == CandidateSource.All)
                {
                    for (var i = 0; i < source.Count; i++)
                    {
                        var page = source.Get(i);
                        signCodes[added[given[i]].Key] = PageCodes.Distinct(page.SignCodes, page.Count, dimensions);
                    }
                }
            }
            finally
            {
                (source as IDisposable)?.Dispose();
            }
        }

        using (gate.Write())
        {
            Dimensions = dimensions;
            foreach (var change in changes)
            {
                if (change.Location is not { } location)
                {
                    if (byKey.Remove(change.Key, out var gone))
                    {
                        Counted(gone.Id, -gone.Entry.VectorCount);
                        byId.Remove(gone.Id);
                        graph?.Remove(gone.Id);
                        centroids?.Remove(gone.Id);
                        if (Source == CandidateSource.All && pageCodes is not null)
                        {
                            pageCodes.Remove(gone.Id);
                            if (pageCodes.CompactionDue)
                            {
                                pageCodes.Compact();
                            }
                        }
                    }

                    continue;
                }

                if (byKey.TryGetValue(change.Key, out var slot))
                {
                    // Same encoder, same page key: the same vectors, so only the location moves.
                    slot.Entry = new ServingEntry(change.Key, location, change.VectorCount);
                    continue;
                }

                if (!readable.Contains(change.Key))
                {
                    Unreadable++;
                    continue;
                }

                var id = nextId++;
                if (encodings.TryGetValue(change.Key, out var encodedPage))
                {
                    graph ??= CandidateGraph.Create(FixedDimensionalEncoding.Length);
                    graph.Add(id, encodedPage);
                }

                if (codes.TryGetValue(change.Key, out var assigned))
                {
                    centroids = trained;
                    centroids!.Add(id, assigned.Assigned, assigned.SignCodes);
                }

                if (signCodes.TryGetValue(change.Key, out var codesOfPage))
                {
                    if (pageCodes is null)
                    {
                        pageCodes = new PageCodes(dimensions);
                        pageCodes.Reserve(ExpectedVectors);
                    }

                    pageCodes.Add(id, codesOfPage.Codes, codesOfPage.Rows);
                }

                byKey[change.Key] = new Slot(id, new ServingEntry(change.Key, location, change.VectorCount));
                byId[id] = change.Key;
                Counted(id, change.VectorCount);
            }

            Generation = generation;
            ChangedSinceRecall += changes.Count;
            sorted = null;
            byKeyOrder = null;
        }
    }

    /// <summary>
    /// The live pages the view's structure ranks best for the query, at most <paramref name="count"/>, in page-key
    /// order (so ties of the exact re-rank break as in the exhaustive search). The graph ranks by encodings; the
    /// centroid lists take the <paramref name="handedOn"/> pages their lists score best (<see cref="CandidateCounts.Probes"/>
    /// centroids a query token) and keep the best of those by Hamming MaxSim over all their vectors' sign codes. A
    /// view of <c>All</c> keeps the best of every page by Hamming MaxSim over its page codes (every page when it holds
    /// none, and a graph view whose graph was let go gives every page). <paramref name="include"/>, when given, says which pages may be candidates (a view of <c>All</c> scores only
    /// those; the others filter what their structure gives).
    /// </summary>
    public IReadOnlyList<ServingEntry> Candidates(VectorSet query, int count, int handedOn, Func<PageKey, bool>? include = null) =>
        Candidates(query, count, handedOn, CandidateCounts.Probes, include: include);

    /// <summary>
    /// As <see cref="Candidates(VectorSet, int, int)"/> with the centroids probed per query token and the lists' cost
    /// rule given (measurement).
    /// </summary>
    internal IReadOnlyList<ServingEntry> Candidates(VectorSet query, int count, int handedOn, int probes, int listEntryCost = CentroidLists.ListEntryCost, Func<PageKey, bool>? include = null)
    {
        ArgumentNullException.ThrowIfNull(query);
        ArgumentOutOfRangeException.ThrowIfLessThan(count, 1);
        using (Source == CandidateSource.Graph ? gate.Write() : gate.Read())
        {
            if (byKey.Count == 0 || query.Count == 0)
            {
                return [];
            }

            if (query.Dimensions != Dimensions)
            {
                throw new InvalidOperationException($"The query has {query.Dimensions} dimensions, the pages {Dimensions}: they come from different encoders.");
            }

            List<ServingEntry> found;
            if ((count >= byKey.Count && include is null) || (Source == CandidateSource.All && pageCodes is null) || (Source == CandidateSource.Graph && graph is null))
            {
                found = [.. byKey.Values.Select(s => s.Entry)];
            }
            else if (Source == CandidateSource.All)
            {
                var queryCodes = new ulong[query.Count * SignCodes.WordsPerCode(Dimensions)];
                SignCodes.Compute(query.Vectors, Dimensions, queryCodes);
                var (ordered, visit) = byKeyOrder ??= KeyOrder(pageCodes!);
                found = [.. pageCodes!.Best(queryCodes, count, ordered, include is null ? null : id => include(byId[id]), CancellationToken.None, visit).Select(id => byKey[byId[id]].Entry)];
            }
            else if (Source == CandidateSource.Centroids)
            {
                found = [.. centroids!.Nearest(query.Vectors, probes, Math.Max(count, handedOn), count, CancellationToken.None, listEntryCost).Select(id => byKey[byId[id]].Entry)];
            }
            else
            {
                encoding ??= new FixedDimensionalEncoding(Dimensions);
                var encoded = new float[FixedDimensionalEncoding.Length];
                encoding.EncodeQuery(query.Vectors, encoded);
                found = [.. graph!.Nearest(encoded, count).Select(id => byKey[byId[id]].Entry)];
            }

            if (include is not null)
            {
                found.RemoveAll(e => !include(e.Key));
            }

            found.Sort((a, b) => string.CompareOrdinal(a.Key.Hex, b.Key.Hex));
            return found;
        }
    }

    /// <summary>The share of the live vectors in the lists the query's tokens probe (measurement: the lists' cost rule).</summary>
    internal double ProbedShare(VectorSet query)
    {
        ArgumentNullException.ThrowIfNull(query);
        using (gate.Read())
        {
            return centroids is null || centroids.LiveVectors == 0 ? 0 : (double)centroids.ProbedEntries(query.Vectors, CandidateCounts.Probes) / centroids.LiveVectors;
        }
    }

    /// <summary>
    /// Every page the centroid lists score for the query, best first by the lists' approximate MaxSim alone
    /// (measurement: where the benchmark finds the exhaustive top-10 pages).
    /// </summary>
    internal IReadOnlyList<ServingEntry> ListRanked(VectorSet query, int probes)
    {
        ArgumentNullException.ThrowIfNull(query);
        using (gate.Read())
        {
            return centroids is null || byKey.Count == 0
                ? []
                : [.. centroids.ListRanked(query.Vectors, probes, byKey.Count, CancellationToken.None).Select(id => byKey[byId[id]].Entry)];
        }
    }

    /// <summary>The live pages' slots in page-key order, and the positions in it by ascending slot. REQUIRES: <c>gate</c> is held.</summary>
    private (int[] Slots, int[] Visit) KeyOrder(PageCodes codes)
    {
        var slots = Entries().Select(e => codes.SlotOf(byKey[e.Key].Id)).ToArray();
        var visit = Enumerable.Range(0, slots.Length).ToArray();
        Array.Sort((int[])slots.Clone(), visit);
        return (slots, visit);
    }

    /// <summary>Every live page, in page-key order.</summary>
    public IReadOnlyList<ServingEntry> Entries()
    {
        using (gate.Read())
        {
            return sorted ??= [.. byKey.Values.Select(s => s.Entry).OrderBy(e => e.Key.Hex, StringComparer.Ordinal)];
        }
    }

    public void Dispose()
    {
        using (gate.Write())
        {
            graph?.Dispose();
            graph = null;
        }
    }

    /// <summary>Writes the view (ServingViewFile) under the gate, shared with searches, so no change lands half-way.</summary>
    internal void Write(Action<IReadOnlyList<(ulong Id, ServingEntry Entry)>, ulong, CandidateGraph?, PageCodes?, CentroidLists?> write)
    {
        using (gate.Read())
        {
            write([.. byKey.Values.Select(s => (s.Id, s.Entry)).OrderBy(e => e.Entry.Key.Hex, StringComparer.Ordinal)], nextId, graph, centroids?.Pages ?? pageCodes, centroids);
        }
    }

    /// <summary>A view as <see cref="ServingViewFile"/> read it back.</summary>
    /// <remarks>REQUIRES: <paramref name="training"/> counts the vectors of <paramref name="entries"/> (the reader checks it).</remarks>
    internal static ServingView Restore(string encoderId, long generation, CandidateSource source, int dimensions, ulong nextId, IReadOnlyList<(ulong Id, ServingEntry Entry)> entries, CandidateGraph? graph, PageCodes? pageCodes, CentroidLists? centroids, CandidateRecall? recall, long changedSinceRecall, TrainingFigures training)
    {
        var view = new ServingView(encoderId, generation, source)
        {
            Dimensions = dimensions, graph = graph, pageCodes = pageCodes, centroids = centroids, nextId = nextId, Recall = recall, ChangedSinceRecall = changedSinceRecall,
            TrainedAt = training.TrainedAt, firstIdAfterTraining = training.FirstIdAfterTraining,
            vectors = training.Vectors, vectorsAddedSinceTraining = training.VectorsAddedSinceTraining,
        };
        foreach (var (id, entry) in entries)
        {
            view.byKey[entry.Key] = new Slot(id, entry);
            view.byId[id] = entry.Key;
        }

        return view;
    }

    /// <summary>Keeps the running vector counts as a page of <paramref name="id"/> comes or goes. REQUIRES: <c>gate</c> is held.</summary>
    private void Counted(ulong id, int vectorCount)
    {
        vectors += vectorCount;
        if (id >= firstIdAfterTraining)
        {
            vectorsAddedSinceTraining += vectorCount;
        }
    }

    /// <summary>
    /// Centroids trained on rows of <paramref name="source"/> taken at an even stride: at most
    /// <see cref="CentroidLists.SamplePerCentroid"/> per centroid.
    /// </summary>
    private CentroidLists Train(IVectorSetSource source, int dimensions, CancellationToken cancellationToken)
    {
        long rows = 0;
        for (var i = 0; i < source.Count; i++)
        {
            rows += source.Get(i).Count;
        }

        var centroidCount = CentroidsWanted > 0 ? CentroidsWanted : CentroidLists.CentroidsFor(Math.Max(rows, ExpectedVectors));
        var wanted = (long)centroidCount * CentroidLists.SamplePerCentroid;
        var step = Math.Max(1, rows / Math.Max(1, wanted));
        var sample = new List<float>();
        var row = new float[dimensions];
        long at = 0;
        for (var i = 0; i < source.Count; i++)
        {
            var vectors = source.Get(i).Vectors;
            for (var r = 0; r < vectors.Length / dimensions; r++, at++)
            {
                if (at % step == 0)
                {
                    System.Numerics.Tensors.TensorPrimitives.ConvertToSingle(vectors.Slice(r * dimensions, dimensions), row);
                    sample.AddRange(row);
                }
            }
        }

        var trained = CentroidLists.Train([.. sample], dimensions, centroidCount, cancellationToken);
        trained.Pages.Reserve(ExpectedVectors);
        return trained;
    }

    private sealed class Slot(ulong id, ServingEntry entry)
    {
        public ulong Id { get; } = id;

        public ServingEntry Entry { get; set; } = entry;
    }
}
