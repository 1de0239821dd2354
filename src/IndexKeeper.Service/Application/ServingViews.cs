using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Index;
using IndexKeeper.Core.Search;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Service.Application;

/// <summary>
/// The serving views of an open index, one per encoder searched (docs/search.md, "Serving view"). A writing
/// process hears every commit that touches vector sets and moves its views forward by those changes alone;
/// a view is read from <c>serving/</c> when the file shows the catalog's state, and built from the catalog
/// only when no change list reaches it. Read-only opens never write the file (reads never write).
/// </summary>
/// <remarks>
/// Locking: <c>gate</c> orders catch-ups, builds and writes of the views; a search that finds it held searches
/// the view held (<c>shown</c>) instead of waiting when that view shows the last commit. <c>pendingGate</c> guards the change list the commit
/// handler fills on the writer's thread (it only appends, never waits for a view).
/// </remarks>
public sealed class ServingViews : IDisposable
{
    /// <summary>Page changes after which a structure's recall figure is measured again, at the least.</summary>
    public const int RecallEveryChanges = 100;

    // Vector sets read and encoded at a time while building a view: bounds memory, not speed.
    private const int BuildChunk = 1024;

    // Segment pages a view's reads may leave mapped in this process before they are let go (docs/daemon.md,
    // "Memory"): a build or an exhaustive pass reads every segment, which would otherwise stay resident whole.
    private const long ResidentSegmentBytes = 128L << 20;

    // Record bytes searches may open before their segment pages are let go. Smaller than a view's: each fault maps
    // the pages around it too (the kernel's fault-around), so a search's resident share is a few times the bytes of
    // the ~1,000 records it re-ranks at 100,000 pages (about 33 MB); measured in docs/benchmarks.md, idle run 6.
    private const long SearchResidentBytes = 32L << 20;

    // Vector sets per slice of the recall figure's exhaustive pass, so its reads are let go between slices.
    private const int ExhaustiveSlice = 4096;

    private readonly IndexCatalog catalog;
    private readonly Func<VectorStore> store;
    private readonly string directory;
    private readonly bool readOnly;
    private readonly CandidateSource source;
    private readonly object gate = new();
    private readonly object pendingGate = new();
    private readonly Dictionary<string, ServingView> views = new(StringComparer.Ordinal);

    // Per encoder what its view file shows, as this process read or wrote it (the generation and the recall figure
    // carried): a view with both unchanged is not written again (at 100,000 pages a write is over 200 MB).
    private readonly Dictionary<string, (long Generation, CandidateRecall? Recall)> onDisk = new(StringComparer.Ordinal);

    // The last view held per encoder, read without the gate: status asks for a view's figures while a build or a
    // catch-up holds the gate for minutes, and must not wait for it (it answers with the view held before).
    private readonly System.Collections.Concurrent.ConcurrentDictionary<string, ServingView> shown = new(StringComparer.Ordinal);
    private readonly List<VectorSetChanges> pending = [];
    private readonly long openedAt;
    private long writtenAt;

    // Record bytes the searches opened since their segment pages were last let go.
    private long searchedBytes;

    // Searches scoring at once, one per core: each already uses every core, so more at once only interleave, and each
    // holds its candidates' records mapped until it ends. The others wait their turn; none is refused.
    private readonly SemaphoreSlim searchSlots = new(Environment.ProcessorCount);

    /// <param name="store">The segment store, asked for only when vector sets are read (opened on first use).</param>
    /// <param name="readOnly">True for a read-only open: the views are never written to disk and no commit is heard.</param>
    /// <param name="source">Where searches take candidates from (<c>Query:Candidates</c>); the views hold its structure.</param>
    public ServingViews(IndexCatalog catalog, Func<VectorStore> store, string directory, bool readOnly, CandidateSource source)
    {
        ArgumentNullException.ThrowIfNull(catalog);
        ArgumentNullException.ThrowIfNull(store);
        ArgumentException.ThrowIfNullOrEmpty(directory);
        this.catalog = catalog;
        this.store = store;
        this.directory = directory;
        this.readOnly = readOnly;
        this.source = source;
        openedAt = catalog.VectorSetGeneration;
        writtenAt = long.MinValue;
        if (!readOnly)
        {
            catalog.VectorSetsCommitted += Heard;
        }
    }

    /// <summary>
    /// CPU seconds per page of a build when this process has not timed one: 256 s for 100,000 pages of 130
    /// vectors on this project's 2-core machine (measured, docs/benchmarks.md, <c>serving</c>, third run).
    /// </summary>
    public const double DefaultBuildSecondsPerPage = 0.0026;

    /// <summary>Views built from the whole catalog in this process (not read from disk, not moved forward by changes).</summary>
    public int Builds { get; private set; }

    /// <summary>The view of <paramref name="encoderId"/> at the catalog's current state.</summary>
    public ServingView For(string encoderId, CancellationToken cancellationToken)
    {
        ArgumentException.ThrowIfNullOrEmpty(encoderId);
        lock (gate)
        {
            var generation = catalog.VectorSetGeneration;
            if (views.TryGetValue(encoderId, out var view) && view.Generation == generation)
            {
                return view;
            }

            if (view is not null && CatchUp(view, generation, cancellationToken))
            {
                return view;
            }

            view?.Dispose();
            views.Remove(encoderId);
            view = Load(encoderId, generation, cancellationToken);
            views[encoderId] = view;
            shown[encoderId] = view;
            return view;
        }
    }

    /// <summary>
    /// The best <paramref name="k"/> pages for <paramref name="query"/>: the two stages of
    /// <see cref="LateInteractionSearch"/> (sign codes, then exact MaxSim of the best) over every live page of the
    /// serving view, or over the candidates its graph or centroid lists give, each count growing with the index
    /// (<see cref="CandidateCounts"/>; docs/search.md, "Serving view"). Only the pages searched are opened (each record checked once per process). A compaction that retires a segment between the view and the open makes the
    /// open refuse; the view is then taken again. Also returns the live vector sets that could not be read.
    /// </summary>
    /// <param name="allowed">Page keys (hex) a hit may have; null for every page. When fewer than the structure
    /// would give, they are the candidates themselves, so a narrow filter ranks exactly.</param>
    public (SearchResult Result, int Unreadable) Search(string encoderId, VectorSet query, int k, CancellationToken cancellationToken, IReadOnlySet<string>? allowed = null)
    {
        ArgumentNullException.ThrowIfNull(query);
        for (var attempt = 1; ; attempt++)
        {
            // While a write or a recall pass holds the gate (a minute for a large view), the first attempt takes the view
            // held when it already shows the last commit; a search waits only when the view must move first.
            var view = attempt == 1 && Busy(encoderId) is { } held ? held : For(encoderId, cancellationToken);
            searchSlots.Wait(cancellationToken);
            try
            {
                return Ranked(view, query, k, cancellationToken, allowed);
            }
            catch (InvalidOperationException) when (attempt < 3)
            {
                // A segment retired by a compaction committed after the view was taken; the next view names its successor.
            }
            finally
            {
                searchSlots.Release();
            }
        }
    }

    /// <summary>
    /// The view held of <paramref name="encoderId"/> when another thread holds the gate and the view shows the last
    /// commit (a write or a recall pass of the current state); null when the gate is free, no view is held or a commit
    /// came since: a search sees the last committed state, so it then waits for the view to move.
    /// </summary>
    private ServingView? Busy(string encoderId)
    {
        if (Monitor.TryEnter(gate))
        {
            Monitor.Exit(gate);
            return null;
        }

        return shown.TryGetValue(encoderId, out var held) && held.Generation == catalog.VectorSetGeneration ? held : null;
    }

    /// <summary>The search of <see cref="Search"/> over <paramref name="view"/>; throws when a segment it names was retired meanwhile.</summary>
    private (SearchResult Result, int Unreadable) Ranked(ServingView view, VectorSet query, int k, CancellationToken cancellationToken, IReadOnlySet<string>? allowed)
    {
        if (query.Count == 0 || view.Count == 0)
        {
            return (new SearchResult([], view.Count, 0), view.Unreadable);
        }

        // The centroid lists hand on only the pages the float re-rank takes (their own sign-code stage ran);
        // the graph hands on more, for the sign-code stage below.
        var reranked = source == CandidateSource.Centroids ? CandidateCounts.RerankedAfterCentroids(k, view.Count) : CandidateCounts.Reranked(k, view.Count);
        var handedOn = source == CandidateSource.Graph ? CandidateCounts.FromGraph(k, view.Count) : CandidateCounts.FromCentroids(k, view.Count);
        // A view of every page scores its page codes in memory and hands on only the pages the float re-rank takes.
        IEnumerable<ServingEntry> candidates = source == CandidateSource.All || allowed is null || allowed.Count > handedOn
            ? view.Candidates(query, source == CandidateSource.Graph ? handedOn : reranked, handedOn, allowed is null ? null : key => allowed.Contains(key.Hex))
            : view.Entries().Where(c => allowed.Contains(c.Key.Hex));

        var encoderId = view.EncoderId;
        var records = candidates.Select(c => Record(encoderId, c)).ToList();
        using var live = store().OpenSelected(encoderId, records);
        var options = new SearchOptions { Top = k, Candidates = reranked };
        var ranked = LateInteractionSearch.Search(live.Source, query, options, cancellationToken);

        // A search maps only the records it re-ranks (the sign codes are the view's), so letting go once they add up
        // to the budget costs the next searches little (before version 5 of the view every page's codes were mapped
        // again: 8 clients 2.3x slower at 10k). Counted here, not read from the process, whose other maps are not ours.
        if (Interlocked.Add(ref searchedBytes, records.Sum(r => (long)r.Length)) > SearchResidentBytes)
        {
            Interlocked.Exchange(ref searchedBytes, 0);
            store().DropResident();
        }

        return (ranked with { PagesScanned = view.Count }, view.Unreadable + live.Unreadable.Count);
    }

    /// <summary>
    /// Measures the recall figure of the view of <paramref name="encoderId"/> (docs/search.md, "Recall"): for each
    /// sample query (<see cref="RecallSample"/>) the share of the exhaustive float16 MaxSim top-10 that this
    /// search returns (a hit whose exact score reaches the 10th exhaustive score counts too: ties are equally
    /// right). Records it on the view (written with it by <see cref="Persist"/>) and returns it. Reads only.
    /// </summary>
    public CandidateRecall MeasureRecall(string encoderId, DateTimeOffset now, CancellationToken cancellationToken) =>
        Measure(For(encoderId, cancellationToken), now, cancellationToken);

    /// <summary>
    /// What the retraining decision needs of the view of <paramref name="encoderId"/> held in memory; null when
    /// none is held (nothing is read for it: the idle daemon asks every turn).
    /// </summary>
    public RetrainingFacts? Retraining(string encoderId, DateTimeOffset? lastAttempt)
    {
        lock (gate)
        {
            return views.TryGetValue(encoderId, out var view)
                ? new RetrainingFacts(source, view.Count, view.Recall, view.AddedShareSinceTraining, view.TrainedAt, lastAttempt)
                : null;
        }
    }

    /// <summary>CPU seconds a build of <paramref name="pages"/> pages is expected to take: as the last build of this process, else <see cref="DefaultBuildSecondsPerPage"/>.</summary>
    public double EstimatedBuildSeconds(long pages) => pages * (BuildSecondsPerPage ?? DefaultBuildSecondsPerPage);

    /// <summary>CPU seconds per page of the last build from the catalog in this process (train + assign); null before one.</summary>
    public double? BuildSecondsPerPage { get; private set; }

    /// <summary>
    /// Trains the view of <paramref name="encoderId"/> again (docs/search.md, "Retraining"): a new view is built from the
    /// catalog beside the one searches use, both are measured on the same sample queries, and the new one replaces
    /// the old only when its figure is no worse (and no commit it has not heard came in between). Only the view, a
    /// cache, changes: no vector set is read for writing. Only for centroid lists.
    /// </summary>
    public ViewRetraining Retrain(string encoderId, DateTimeOffset now, CancellationToken cancellationToken)
    {
        if (source != CandidateSource.Centroids)
        {
            throw new InvalidOperationException($"Only centroid lists are trained; these views take candidates from {source}.");
        }

        var held = For(encoderId, cancellationToken);
        var before = Measure(held, now, cancellationToken);
        var watch = System.Diagnostics.Stopwatch.StartNew();
        var fresh = Build(encoderId, held.Generation, cancellationToken);
        var buildWall = watch.Elapsed.TotalSeconds;
        var swapped = false;
        try
        {
            fresh.MarkTrained(now);
            var after = Measure(fresh, now, cancellationToken);
            lock (gate)
            {
                var generation = catalog.VectorSetGeneration;
                swapped = after.Recall >= before.Recall
                    && views.TryGetValue(encoderId, out var current) && ReferenceEquals(current, held)
                    && (fresh.Generation == generation || CatchUp(fresh, generation, cancellationToken));
                if (swapped)
                {
                    views[encoderId] = fresh;
                    shown[encoderId] = fresh;
                    held.Dispose();
                    writtenAt = long.MinValue;
                }
            }

            return new ViewRetraining(swapped, before, after, fresh.CentroidCount, fresh.Count, buildWall, BuildSecondsPerPage);
        }
        finally
        {
            if (!swapped)
            {
                fresh.Dispose();
            }
        }
    }

    /// <summary>Measures <paramref name="view"/>'s recall figure (see <see cref="MeasureRecall"/>) and records it on the view.</summary>
    private CandidateRecall Measure(ServingView view, DateTimeOffset now, CancellationToken cancellationToken)
    {
        var encoderId = view.EncoderId;
        var entries = view.Entries();
        var positions = RecallSample.Positions(entries.Count, RecallSample.Queries, view.Generation);
        var queries = new List<VectorSet>();
        using (var drawn = store().OpenSelected(encoderId, [.. positions.Select(p => Record(encoderId, entries[p]))]))
        {
            for (var i = 0; i < drawn.Source.Count; i++)
            {
                if (drawn.Source.Get(i).Count > 0)
                {
                    queries.Add(RecallSample.Query(drawn.Source.Get(i)));
                }
            }
        }

        double kept = 0;
        var exhaustives = Exhaustive(encoderId, entries, queries, 10, cancellationToken);
        for (var q = 0; q < queries.Count; q++)
        {
            var (query, exhaustive) = (queries[q], exhaustives[q]);
            var truth = exhaustive.Select(h => h.Key).ToHashSet();
            var tenth = exhaustive.Count < 10 ? float.NegativeInfinity : exhaustive[^1].Score;
            var served = Ranked(view, query, 10, cancellationToken, allowed: null).Result.Hits;
            kept += truth.Count == 0 ? 1 : (double)served.Count(h => truth.Contains(h.Key) || h.Score >= tenth) / truth.Count;
        }

        var recall = new CandidateRecall(queries.Count == 0 ? 1 : kept / queries.Count, queries.Count, view.Generation, now);
        view.Measured(recall);
        return recall;
    }

    /// <summary>
    /// For each query, the best <paramref name="top"/> of <paramref name="entries"/> by exact float16 MaxSim, best
    /// first: each slice opened once and searched exhaustively for every query, the slices' best merged (exact: a
    /// page's score does not depend on its slice), the segment pages read let go between slices.
    /// </summary>
    private List<SearchHit>[] Exhaustive(string encoderId, IReadOnlyList<ServingEntry> entries, IReadOnlyList<VectorSet> queries, int top, CancellationToken cancellationToken)
    {
        var best = queries.Select(_ => new List<SearchHit>()).ToArray();
        var options = new SearchOptions { Top = top, Candidates = int.MaxValue };
        foreach (var slice in entries.Chunk(ExhaustiveSlice))
        {
            using (var some = store().OpenSelected(encoderId, [.. slice.Select(e => Record(encoderId, e))]))
            {
                for (var q = 0; q < queries.Count; q++)
                {
                    best[q].AddRange(LateInteractionSearch.Search(some.Source, queries[q], options, cancellationToken).Hits);
                    best[q] = [.. best[q].OrderByDescending(h => h.Score).Take(top)];
                }
            }

            TrimResident();
        }

        return best;
    }

    /// <summary>Lets go of the segment pages the reads left mapped once they pass <see cref="ResidentSegmentBytes"/>.</summary>
    private void TrimResident() => store().TrimResident(ResidentSegmentBytes);

    /// <summary>
    /// The last recall figure of the view of <paramref name="encoderId"/> held in memory or, with
    /// <paramref name="readFile"/>, on disk (the whole file is read to check it); null when none was measured or
    /// the candidates come from every page.
    /// </summary>
    public CandidateRecall? LastRecall(string encoderId, bool readFile = true)
    {
        if (source == CandidateSource.All)
        {
            return null;
        }

        if (shown.TryGetValue(encoderId, out var held))
        {
            return held.Recall;
        }

        return readFile ? ServingViewFile.ReadFigures(directory, encoderId, source)?.Recall : null;
    }

    /// <summary>
    /// When the centroids of the view of <paramref name="encoderId"/> were trained and the share of its vectors added
    /// since: of the view held in memory, else of the view file (the whole file is read to check it); nulls when
    /// neither knows.
    /// </summary>
    public (DateTimeOffset? TrainedAt, double? AddedShare) LastTraining(string encoderId)
    {
        if (shown.TryGetValue(encoderId, out var held))
        {
            return (held.TrainedAt, held.AddedShareSinceTraining);
        }

        return ServingViewFile.ReadFigures(directory, encoderId, source) is { } figures ? (figures.TrainedAt, figures.AddedShare) : (null, null);
    }

    /// <summary>
    /// Writes the views of the searched encoders to <c>serving/</c> when the catalog moved since they were last
    /// written. Only a writing open does this; a failure leaves the old file, which then reads as stale. A view
    /// whose candidates come from a structure first gets a new recall figure when it has none or when more than
    /// one page in 100 (at least <see cref="RecallEveryChanges"/>) changed since the last.
    /// </summary>
    public void Persist(CancellationToken cancellationToken)
    {
        if (readOnly)
        {
            return;
        }

        lock (gate)
        {
            var generation = catalog.VectorSetGeneration;
            if (generation == writtenAt)
            {
                return;
            }

            var stamp = catalog.CreatedTicks;
            var encoders = new HashSet<string>(views.Keys, StringComparer.Ordinal);
            if (catalog.Encoders.ServingId() is { } serving)
            {
                encoders.Add(serving);
            }

            foreach (var encoderId in encoders)
            {
                if (!views.ContainsKey(encoderId) && ServingViewFile.TryRead(directory, encoderId, stamp, generation, source, mapOnly: true, out _) is { } fresh)
                {
                    // Already on disk as it is now (an earlier process wrote it): nothing to do.
                    fresh.Dispose();
                    continue;
                }

                var view = For(encoderId, cancellationToken);
                if (source != CandidateSource.All && view.Count > 0
                    && (view.Recall is null || view.ChangedSinceRecall >= Math.Max(RecallEveryChanges, view.Count / 100)))
                {
                    MeasureRecall(encoderId, DateTimeOffset.UtcNow, cancellationToken);
                }
                else if (onDisk.TryGetValue(encoderId, out var written) && written == (view.Generation, view.Recall))
                {
                    continue;
                }

                ServingViewFile.Write(directory, view, stamp);
                onDisk[encoderId] = (view.Generation, view.Recall);
            }

            writtenAt = generation;
        }
    }

    public void Dispose()
    {
        searchSlots.Dispose();
        if (!readOnly)
        {
            catalog.VectorSetsCommitted -= Heard;
        }

        lock (gate)
        {
            foreach (var view in views.Values)
            {
                view.Dispose();
            }

            views.Clear();
            shown.Clear();
        }
    }

    /// <summary>REQUIRES: <c>gate</c> is held.</summary>
    private ServingView Load(string encoderId, long generation, CancellationToken cancellationToken)
    {
        var stamp = catalog.CreatedTicks;
        if (ServingViewFile.TryRead(directory, encoderId, stamp, generation, source, mapOnly: readOnly, out _) is { } current)
        {
            onDisk[encoderId] = (generation, current.Recall);
            return current;
        }

        // A writer that heard every commit since it opened can start from the file as it was then.
        if (!readOnly && openedAt != generation
            && ServingViewFile.TryRead(directory, encoderId, stamp, openedAt, source, mapOnly: false, out _) is { } older)
        {
            if (CatchUp(older, generation, cancellationToken))
            {
                return older;
            }

            older.Dispose();
        }

        return Build(encoderId, generation, cancellationToken);
    }

    /// <summary>
    /// Moves <paramref name="view"/> to <paramref name="generation"/> by the heard changes; false when they do
    /// not reach from its generation to that one (a commit not heard). REQUIRES: <c>gate</c> is held.
    /// </summary>
    private bool CatchUp(ServingView view, long generation, CancellationToken cancellationToken)
    {
        List<VectorSetChanges> steps;
        lock (pendingGate)
        {
            steps = [.. pending.Where(p => p.Generation > view.Generation && p.Generation <= generation).OrderBy(p => p.Generation)];
        }

        for (var i = 0; i < steps.Count; i++)
        {
            if (steps[i].Generation != view.Generation + 1 + i)
            {
                return false;
            }
        }

        if (view.Generation + steps.Count != generation)
        {
            return false;
        }

        var changes = steps.SelectMany(s => s.Changed).Where(c => c.EncoderId == view.EncoderId).Select(ToChange).ToList();
        view.Apply(generation, changes, locations => Open(view.EncoderId, locations), cancellationToken);
        TrimResident();
        Trim();
        return true;
    }

    /// <summary>The view from the catalog's live vector sets, every one read and encoded. REQUIRES: <c>gate</c> is held.</summary>
    private ServingView Build(string encoderId, long generation, CancellationToken cancellationToken)
    {
        // Stamped with the generation read before the list: commits that land while it is read (the daemon's
        // writer does not wait for searches) are applied again by the next catch-up, and each change states a
        // final state, so one already in the list changes nothing.
        var live = catalog.VectorSets.Live(encoderId);
        var view = new ServingView(encoderId, generation, source, live.Sum(r => (long)r.VectorCount));
        var cpu = ProcessCpu();
        try
        {
            foreach (var chunk in BuildChunks(live))
            {
                view.Apply(generation, [.. chunk.Select(ToChange)], locations => Open(encoderId, locations), cancellationToken);
                TrimResident();
            }

            Builds++;
            view.MarkTrained(DateTimeOffset.UtcNow);
            if (view.Count > 0)
            {
                // The process's CPU (both cores share a build); searches beside it add a little.
                BuildSecondsPerPage = (ProcessCpu() - cpu).TotalSeconds / view.Count;
            }

            return view;
        }
        catch
        {
            view.Dispose();
            throw;
        }
    }

    /// <summary>
    /// The live list in the chunks a build applies: the first spread evenly over the list, so centroids trained
    /// on it sample the whole index rather than its oldest pages; the rest follow in the catalog's order.
    /// </summary>
    public static IEnumerable<VectorSetRecord[]> BuildChunks(IReadOnlyList<VectorSetRecord> live)
    {
        ArgumentNullException.ThrowIfNull(live);
        var step = Math.Max(1, live.Count / BuildChunk);
        var first = Enumerable.Range(0, live.Count).Where(i => i % step == 0).Take(BuildChunk).ToHashSet();
        return first.Order().Select(i => live[i]).Concat(live.Where((_, i) => !first.Contains(i))).Chunk(BuildChunk);
    }

    private (IVectorSetSource Source, IReadOnlyList<int> Given) Open(string encoderId, IReadOnlyList<RecordLocation> locations)
    {
        var records = locations.Select(l => new VectorSetRecord
        {
            EncoderId = encoderId,
            SegmentId = l.SegmentId,
            Offset = l.Offset,
            Length = l.Length,
            Checksum = l.Checksum,
        }).ToList();
        var live = store().OpenSelected(encoderId, records);
        var unreadable = live.Unreadable.Select(u => u.Record).ToHashSet();
        return (live.Source, [.. Enumerable.Range(0, records.Count).Where(i => !unreadable.Contains(records[i]))]);
    }

    private static TimeSpan ProcessCpu()
    {
        using var self = System.Diagnostics.Process.GetCurrentProcess();
        return self.TotalProcessorTime;
    }

    private void Heard(VectorSetChanges changes)
    {
        lock (pendingGate)
        {
            pending.Add(changes);
        }
    }

    /// <summary>Forgets heard changes every view and the file of the open already have.</summary>
    private void Trim()
    {
        // Until a view exists the list reaches back to the open, so a writer can move the file of then forward.
        var floor = views.Count == 0 ? openedAt : views.Values.Min(v => v.Generation);
        lock (pendingGate)
        {
            pending.RemoveAll(p => p.Generation <= floor);
        }
    }

    private static VectorSetRecord Record(string encoderId, ServingEntry entry) => new()
    {
        EncoderId = encoderId,
        PageKey = entry.Key.Hex,
        SegmentId = entry.Location.SegmentId,
        Offset = entry.Location.Offset,
        Length = entry.Location.Length,
        Checksum = entry.Location.Checksum,
        VectorCount = entry.VectorCount,
        Live = true,
    };

    private static ServingChange ToChange(VectorSetRecord record) =>
        new(PageKey.Parse(record.PageKey), record.Live ? new RecordLocation(record.SegmentId, record.Offset, record.Length, unchecked((uint)record.Checksum)) : null, record.VectorCount);
}
