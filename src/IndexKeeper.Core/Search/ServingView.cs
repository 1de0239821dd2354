using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Core.Search;

/// <summary>
/// What search needs of one encoder's live pages, kept between queries (docs/search.md, "Serving view"): the
/// page directory (page key → record location) and the candidate graph of the pages' fixed dimensional
/// encodings. It reflects one catalog vector-set generation and moves forward by <see cref="Apply"/>, one
/// commit's changes at a time; <see cref="ServingViewFile"/> keeps it on disk for the next process.
/// </summary>
/// <remarks>
/// Locking: <c>gate</c> guards the directory and the graph; searches hold it only to find candidates.
/// <see cref="Apply"/> encodes pages outside it and holds it only to insert. REQUIRES: one caller of
/// <see cref="Apply"/> at a time (the writer).
/// </remarks>
public sealed class ServingView : IDisposable
{
    private readonly object gate = new();
    private readonly Dictionary<PageKey, Slot> byKey = [];
    private readonly Dictionary<ulong, PageKey> byId = [];
    private FixedDimensionalEncoding? encoding;
    private CandidateGraph? graph;
    private ulong nextId = 1;

    // Every live page in page-key order, made on first use after a change: a search over all pages asks per query.
    private ServingEntry[]? sorted;

    public ServingView(string encoderId, long generation)
    {
        ArgumentException.ThrowIfNullOrEmpty(encoderId);
        EncoderId = encoderId;
        Generation = generation;
    }

    public string EncoderId { get; }

    /// <summary>The catalog vector-set generation this view shows.</summary>
    public long Generation { get; private set; }

    /// <summary>Dimensions of the vectors (0 while the view is empty and has never held a page).</summary>
    public int Dimensions { get; private set; }

    public int Count
    {
        get
        {
            lock (gate)
            {
                return byKey.Count;
            }
        }
    }

    /// <summary>Bytes of the candidate graph in memory, estimated as the package lays it out (encoding + links).</summary>
    public long GraphBytesEstimate => Count * ((FixedDimensionalEncoding.Length * 2L) + (2 * 16 * 4) + 16);

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
        lock (gate)
        {
            added = [.. changes.Where(c => c.Location is not null && !byKey.ContainsKey(c.Key))];
        }

        var encodings = new Dictionary<PageKey, float[]>();
        var dimensions = Dimensions;
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
                }

                // Encoding is the cost of a build (every vector times 200 dot products): both cores share it.
                var encoded = new float[source.Count][];
                if (source.Count > 0)
                {
                    var encoder = encoding ??= new FixedDimensionalEncoding(dimensions);
                    Parallel.For(0, source.Count, new ParallelOptions { CancellationToken = cancellationToken }, i =>
                    {
                        encoded[i] = new float[FixedDimensionalEncoding.Length];
                        encoder.EncodePage(source.Get(i).Vectors, encoded[i]);
                    });
                }

                for (var i = 0; i < encoded.Length; i++)
                {
                    encodings[added[given[i]].Key] = encoded[i];
                }
            }
            finally
            {
                (source as IDisposable)?.Dispose();
            }
        }

        lock (gate)
        {
            Dimensions = dimensions;
            foreach (var change in changes)
            {
                if (change.Location is not { } location)
                {
                    if (byKey.Remove(change.Key, out var gone))
                    {
                        byId.Remove(gone.Id);
                        graph!.Remove(gone.Id);
                    }

                    continue;
                }

                if (byKey.TryGetValue(change.Key, out var slot))
                {
                    // Same encoder, same page key: the same vectors, so only the location moves.
                    slot.Entry = new ServingEntry(change.Key, location, change.VectorCount);
                    continue;
                }

                if (!encodings.TryGetValue(change.Key, out var encodedPage))
                {
                    Unreadable++;
                    continue;
                }

                var id = nextId++;
                graph ??= CandidateGraph.Create(FixedDimensionalEncoding.Length);
                graph.Add(id, encodedPage);
                byKey[change.Key] = new Slot(id, new ServingEntry(change.Key, location, change.VectorCount));
                byId[id] = change.Key;
            }

            Generation = generation;
            sorted = null;
        }
    }

    /// <summary>
    /// The live pages whose encodings best match the query's, at most <paramref name="count"/>, in page-key
    /// order (so ties of the exact re-rank break as in the exhaustive search).
    /// </summary>
    public IReadOnlyList<ServingEntry> Candidates(VectorSet query, int count)
    {
        ArgumentNullException.ThrowIfNull(query);
        ArgumentOutOfRangeException.ThrowIfLessThan(count, 1);
        lock (gate)
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
            if (count >= byKey.Count)
            {
                found = [.. byKey.Values.Select(s => s.Entry)];
            }
            else
            {
                encoding ??= new FixedDimensionalEncoding(Dimensions);
                var encoded = new float[FixedDimensionalEncoding.Length];
                encoding.EncodeQuery(query.Vectors, encoded);
                found = [.. graph!.Nearest(encoded, count).Select(id => byKey[byId[id]].Entry)];
            }

            found.Sort((a, b) => string.CompareOrdinal(a.Key.Hex, b.Key.Hex));
            return found;
        }
    }

    /// <summary>Every live page, in page-key order.</summary>
    public IReadOnlyList<ServingEntry> Entries()
    {
        lock (gate)
        {
            return sorted ??= [.. byKey.Values.Select(s => s.Entry).OrderBy(e => e.Key.Hex, StringComparer.Ordinal)];
        }
    }

    public void Dispose()
    {
        lock (gate)
        {
            graph?.Dispose();
            graph = null;
        }
    }

    /// <summary>Writes the view (ServingViewFile) under the gate, so no change lands half-way.</summary>
    internal void Write(Action<IReadOnlyList<(ulong Id, ServingEntry Entry)>, ulong, CandidateGraph?> write)
    {
        lock (gate)
        {
            write([.. byKey.Values.Select(s => (s.Id, s.Entry)).OrderBy(e => e.Entry.Key.Hex, StringComparer.Ordinal)], nextId, graph);
        }
    }

    /// <summary>A view as <see cref="ServingViewFile"/> read it back.</summary>
    internal static ServingView Restore(string encoderId, long generation, int dimensions, ulong nextId, IReadOnlyList<(ulong Id, ServingEntry Entry)> entries, CandidateGraph? graph)
    {
        var view = new ServingView(encoderId, generation) { Dimensions = dimensions, graph = graph, nextId = nextId };
        foreach (var (id, entry) in entries)
        {
            view.byKey[entry.Key] = new Slot(id, entry);
            view.byId[id] = entry.Key;
        }

        return view;
    }

    private sealed class Slot(ulong id, ServingEntry entry)
    {
        public ulong Id { get; } = id;

        public ServingEntry Entry { get; set; } = entry;
    }
}
