using IndexKeeper.Core.Detect;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Queue;

namespace IndexKeeper.Core.Catalog;

/// <summary>
/// The catalog's figures kept as running counts in this process (issues 13 and 15): seeded by one pass over
/// every document, page, queue and live vector-set record at the first <see cref="Refresh"/>, then moved by
/// re-reading only the records the writes since named (<see cref="CatalogMarks"/>), so a sample after a commit
/// costs what the commit changed, not the size of the index. Nothing is stored: a new process counts anew.
/// <see cref="Recount"/> compares with a fresh pass (the writer's rare check) and adopts it.
/// </summary>
/// <remarks>
/// Thread-safe: every member holds the catalog's counts gate (<see cref="CatalogStore.CountsGate"/>), which a
/// transaction holds too, so the writer's loop and <c>status</c> requests may refresh and read it at any time.
/// </remarks>
public sealed class RunningCounts
{
    private readonly CatalogStore store;
    private readonly HistoryTable history;
    private Tally? tally;

    internal RunningCounts(CatalogStore store, HistoryTable history)
    {
        this.store = store;
        this.history = history;
    }

    /// <summary>Brings the counts up to date with every write so far (the first call counts everything).</summary>
    public void Refresh()
    {
        lock (store.CountsGate)
        {
            RefreshHeld();
        }
    }

    private void RefreshHeld()
    {
        if (tally is null)
        {
            tally = Seed();
            return;
        }

        // The records the marks name, read a few queries per table rather than one lookup each (ByKeys).
        var (documents, pages, queue, sets) = store.Marks.Take();
        var documentRecords = ByKeys.Find(store.Documents, documents, d => d.Id);
        foreach (var id in documents)
        {
            tally.Document(id, documentRecords.GetValueOrDefault(id));
        }

        var keys = new HashSet<string>(pages, StringComparer.Ordinal);
        keys.UnionWith(queue);
        keys.UnionWith(sets.Values.Select(s => s.PageKey));
        foreach (var key in keys)
        {
            tally.Join(key, -1);
        }

        var pageRecords = store.PageDocuments(pages);
        foreach (var key in pages)
        {
            tally.Page(key, CatalogStore.References(pageRecords.GetValueOrDefault(key)));
        }

        var queueRecords = ByKeys.Find(store.Queue, queue, q => q.Id);
        foreach (var key in queue)
        {
            tally.Queued(key, queueRecords.GetValueOrDefault(key));
        }

        var setRecords = ByKeys.Find(store.VectorSets, sets.Keys, v => v.Id);
        foreach (var (id, (encoderId, pageKey)) in sets)
        {
            tally.VectorSet(encoderId, pageKey, setRecords.GetValueOrDefault(id) is { } set ? set.Live : null);
        }

        foreach (var key in keys)
        {
            tally.Join(key, 1);
        }
    }

    /// <summary>
    /// Counts everything again and adopts the fresh counts; returns what differed from the running ones (empty
    /// when they agreed). O(index): the writer runs it rarely, never per commit.
    /// </summary>
    public IReadOnlyList<string> Recount()
    {
        lock (store.CountsGate)
        {
            return RecountHeld();
        }
    }

    private IReadOnlyList<string> RecountHeld()
    {
        RefreshHeld();
        var running = tally!;
        var fresh = Seed();
        fresh.Watch(running.WatchedServing, running.WatchedActive);
        tally = fresh;
        return running.Differences(fresh);
    }

    /// <summary>The counts of <see cref="IndexCatalog.Figures"/>. REQUIRES: <see cref="Refresh"/> called.</summary>
    public CatalogFigures Figures() => Held(t =>
        new CatalogFigures(t.DocumentsLive, t.DocumentsQuarantined - t.DocumentsUnsupported, t.DocumentsUnsupported, t.PagesReferenced, t.PageLocations, t.QueuedAll, history.LastScanUtc()));

    /// <summary>As <see cref="QueueTable.Depths"/>. REQUIRES: <see cref="Refresh"/> called.</summary>
    public IReadOnlyDictionary<QueuePriority, long> Depths() =>
        Held(t => Enum.GetValues<QueuePriority>().ToDictionary(p => p, p => t.Depths.GetValueOrDefault(p)));

    /// <summary>
    /// Queued pages by priority that may be tried at <paramref name="nowUtc"/>, as <see cref="QueueTable.Due"/> counts
    /// them (quarantined ones included: their time lies far ahead). Costs the number of distinct not-before times, which
    /// is small: a scan or a migration step enqueues its pages under one time, only back-offs have their own. Refreshes
    /// the counts first, as <see cref="Read"/> does: the gate asks it before every batch.
    /// </summary>
    public QueuedPages Due(DateTime nowUtc)
    {
        var now = nowUtc.ToUniversalTime().Ticks;
        return Read(counts => counts.Held(t => new QueuedPages(t.DueOf(QueuePriority.Fresh, now), t.DueOf(QueuePriority.Migration, now), t.DueOf(QueuePriority.Canary, now))));
    }

    /// <summary>Live vector sets of every encoder, as <see cref="VectorSetTable.Count"/> with liveOnly. REQUIRES: <see cref="Refresh"/> called.</summary>
    public long LiveVectorSets => Held(t => t.LiveVectorSets);

    /// <summary>Vector-set records of every encoder, live or not, as <see cref="VectorSetTable.Count"/> without liveOnly. REQUIRES: <see cref="Refresh"/> called.</summary>
    public long VectorSetRecords => Held(t => t.LiveVectorSets + t.DeadVectorSets);

    /// <summary>Live documents by kind, as <see cref="DocumentTable.LiveByKind"/>. REQUIRES: <see cref="Refresh"/> called.</summary>
    public IReadOnlyDictionary<DocumentKind, long> LiveByKind() => Held(t => t.LiveKinds.Where(k => k.Value > 0).ToDictionary(k => k.Key, k => k.Value));

    /// <summary>Ids of the quarantined documents, in id order, as <see cref="DocumentTable.Quarantined"/> finds them. REQUIRES: <see cref="Refresh"/> called.</summary>
    public IReadOnlyList<string> QuarantinedDocumentIds() => Held(t => t.QuarantinedIds.Order(StringComparer.Ordinal).ToList());

    /// <summary>As <see cref="DocumentTable.TotalsByRoot"/>. REQUIRES: <see cref="Refresh"/> called.</summary>
    public IReadOnlyList<RootTotals> TotalsByRoot() =>
        Held(t => t.Roots.Where(r => r.Value.Documents > 0)
            .Select(r => new RootTotals(r.Key, r.Value.Live, r.Value.Quarantined, r.Value.PageLocations, r.Value.Bytes))
            .OrderBy(r => r.Root, StringComparer.Ordinal)
            .ToList());

    /// <summary>
    /// Referenced pages (live documents hold them) against the live vector sets of the serving and the active
    /// encoder. A change of either encoder costs one pass over the counted pages (a switch-over, rare).
    /// REQUIRES: <see cref="Refresh"/> called.
    /// </summary>
    public PageCoverage Coverage(string servingEncoderId, string activeEncoderId) => Held(t =>
    {
        t.Watch(servingEncoderId, activeEncoderId);
        return new PageCoverage(t.PagesReferenced, t.CoveredServing, t.CoveredActive, t.UncoveredNotQueued);
    });

    /// <summary>
    /// Whether a referenced page is covered by a live vector set of the serving encoder and whether it is queued;
    /// null for a page no live document holds. REQUIRES: <see cref="Refresh"/> called.
    /// </summary>
    public (bool Covered, bool Queued)? PageState(string servingEncoderId, string pageKey) =>
        Held<(bool Covered, bool Queued)?>(t => t.References.GetValueOrDefault(pageKey) > 0 ? (t.IsLive(servingEncoderId, pageKey), t.Queue.ContainsKey(pageKey)) : null);

    /// <summary>
    /// Pages with a live vector set of <paramref name="servingEncoderId"/> that also have one of
    /// <paramref name="activeEncoderId"/> (migrated) and those that do not (drifted), as <c>DriftPolicy</c> counts
    /// them; both 0 when the two are one encoder. REQUIRES: <see cref="Refresh"/> called.
    /// </summary>
    public (long Drifted, long Migrated) Migration(string servingEncoderId, string activeEncoderId)
    {
        if (servingEncoderId == activeEncoderId)
        {
            return (0, 0);
        }

        // As DriftReconciler reads it: only registered encoders have pages (the store registers every one it writes).
        var servingKnown = store.Encoders.FindById(servingEncoderId) is not null;
        var activeKnown = store.Encoders.FindById(activeEncoderId) is not null;
        return Held(t =>
        {
            var serving = servingKnown ? t.LivePagesOf(servingEncoderId) : [];
            var migrated = activeKnown ? serving.LongCount(key => t.IsLive(activeEncoderId, key)) : 0;
            return (serving.Count - migrated, migrated);
        });
    }

    /// <summary>
    /// Refreshes the counts and reads them in one hold of the gate, so every figure read shows the same state.
    /// </summary>
    public T Read<T>(Func<RunningCounts, T> read)
    {
        ArgumentNullException.ThrowIfNull(read);
        lock (store.CountsGate)
        {
            RefreshHeld();
            return read(this);
        }
    }

    private Tally Current => tally ?? throw new InvalidOperationException("RunningCounts.Refresh must be called first.");

    // Every read of the tally holds the counts gate (re-entered within Read and Recount).
    private T Held<T>(Func<Tally, T> read)
    {
        lock (store.CountsGate)
        {
            return read(Current);
        }
    }

    private Tally Seed()
    {
        // Marks made before this pass are covered by it; later ones move the new tally.
        store.Marks.Restart();
        var t = new Tally();
        foreach (var document in store.Documents.FindAll())
        {
            t.Document(document.Id, document);
        }

        foreach (var row in store.Pages.Query().Select(p => new { p.Id, p.References }).ToEnumerable())
        {
            t.Page(row.Id, row.References);
        }

        foreach (var entry in store.Queue.FindAll())
        {
            t.Queued(entry.Id, entry);
        }

        foreach (var row in store.VectorSets.Query().Select(v => new { v.EncoderId, v.PageKey, v.Live }).ToEnumerable())
        {
            t.VectorSet(row.EncoderId, row.PageKey, row.Live);
        }

        return t;
    }

    /// <summary>The per-record shares and their sums.</summary>
    private sealed class Tally
    {
        private readonly Dictionary<string, DocumentShare> documents = new(StringComparer.Ordinal);
        private readonly Dictionary<string, HashSet<string>> livePages = new(StringComparer.Ordinal);

        // Records kept after their page went (until a compaction drops them): few, so their ids are kept.
        private readonly HashSet<string> deadSets = new(StringComparer.Ordinal);

        public Dictionary<string, int> References { get; } = new(StringComparer.Ordinal);

        public Dictionary<string, (QueuePriority Priority, bool Quarantined, long NotBefore)> Queue { get; } = new(StringComparer.Ordinal);

        // Per priority, queued pages by not-before time (UTC ticks).
        private readonly Dictionary<QueuePriority, SortedDictionary<long, long>> notBefore = [];

        public Dictionary<string, RootSums> Roots { get; } = new(StringComparer.Ordinal);

        public Dictionary<QueuePriority, long> Depths { get; } = [];

        public long DocumentsLive { get; private set; }

        public long DocumentsQuarantined { get; private set; }

        public long DocumentsUnsupported { get; private set; }

        public long PagesReferenced { get; private set; }

        public long PageLocations { get; private set; }

        public long QueuedAll => Queue.Count;

        public long LiveVectorSets { get; private set; }

        public long DeadVectorSets => deadSets.Count;

        public Dictionary<DocumentKind, long> LiveKinds { get; } = [];

        public HashSet<string> QuarantinedIds { get; } = new(StringComparer.Ordinal);

        public string? WatchedServing { get; private set; }

        public string? WatchedActive { get; private set; }

        public long CoveredServing { get; private set; }

        public long CoveredActive { get; private set; }

        public long UncoveredNotQueued { get; private set; }

        /// <summary>Queued pages of <paramref name="priority"/> whose not-before time is at or before <paramref name="nowTicks"/>.</summary>
        public long DueOf(QueuePriority priority, long nowTicks)
        {
            long due = 0;
            if (notBefore.TryGetValue(priority, out var times))
            {
                foreach (var (ticks, pages) in times)
                {
                    if (ticks > nowTicks)
                    {
                        break;
                    }

                    due += pages;
                }
            }

            return due;
        }

        public bool IsLive(string encoderId, string pageKey) => livePages.TryGetValue(encoderId, out var keys) && keys.Contains(pageKey);

        public IReadOnlyCollection<string> LivePagesOf(string encoderId) => livePages.TryGetValue(encoderId, out var keys) ? keys : [];

        public void Document(string id, DocumentRecord? now)
        {
            if (documents.Remove(id, out var old))
            {
                Add(old, -1);
                QuarantinedIds.Remove(id);
            }

            if (now is not null)
            {
                var share = new DocumentShare(
                    now.Root,
                    now.State,
                    now.State == DocumentState.Quarantined && now.QuarantineReason == QuarantineReason.Unsupported && !ReadableTypes.IsReadable(now.Path),
                    now.PageKeys.Count,
                    now.Size,
                    now.Kind);
                documents[id] = share;
                Add(share, 1);
                if (now.State == DocumentState.Quarantined)
                {
                    QuarantinedIds.Add(id);
                }
            }
        }

        /// <summary>REQUIRES: the page's coverage share taken out (<see cref="Join"/> -1) before, put back after.</summary>
        public void Page(string key, int references)
        {
            if (References.Remove(key, out var old))
            {
                PageLocations -= old;
                PagesReferenced -= old > 0 ? 1 : 0;
            }

            if (references != 0)
            {
                References[key] = references;
                PageLocations += references;
                PagesReferenced += references > 0 ? 1 : 0;
            }
        }

        /// <inheritdoc cref="Page"/>
        public void Queued(string key, QueueRecord? now)
        {
            if (Queue.Remove(key, out var old))
            {
                Depths[old.Priority] = Depths.GetValueOrDefault(old.Priority) - (old.Quarantined ? 0 : 1);
                var times = notBefore[old.Priority];
                if ((times[old.NotBefore] -= 1) == 0)
                {
                    times.Remove(old.NotBefore);
                }
            }

            if (now is not null)
            {
                var quarantined = now.QuarantinedUtc is not null;
                var ticks = now.NotBeforeUtc.ToUniversalTime().Ticks;
                Queue[key] = (now.Priority, quarantined, ticks);
                if (!quarantined)
                {
                    Depths[now.Priority] = Depths.GetValueOrDefault(now.Priority) + 1;
                }

                if (!notBefore.TryGetValue(now.Priority, out var times))
                {
                    times = [];
                    notBefore[now.Priority] = times;
                }

                times[ticks] = times.GetValueOrDefault(ticks) + 1;
            }
        }

        /// <inheritdoc cref="Page"/>
        /// <param name="live">Whether the record is live; null when there is no record (any more).</param>
        public void VectorSet(string encoderId, string pageKey, bool? live)
        {
            if (!livePages.TryGetValue(encoderId, out var keys))
            {
                keys = new HashSet<string>(StringComparer.Ordinal);
                livePages[encoderId] = keys;
            }

            if (live == true ? keys.Add(pageKey) : keys.Remove(pageKey))
            {
                LiveVectorSets += live == true ? 1 : -1;
            }

            var id = VectorSetRecord.MakeId(encoderId, pageKey);
            _ = live == false ? deadSets.Add(id) : deadSets.Remove(id);
        }

        /// <summary>Adds (<paramref name="sign"/> 1) or takes out (-1) one page's share of the coverage counts.</summary>
        public void Join(string key, int sign)
        {
            if (WatchedServing is null || WatchedActive is null || References.GetValueOrDefault(key) <= 0)
            {
                return;
            }

            var covered = IsLive(WatchedServing, key);
            CoveredServing += covered ? sign : 0;
            CoveredActive += IsLive(WatchedActive, key) ? sign : 0;
            UncoveredNotQueued += !covered && !Queue.ContainsKey(key) ? sign : 0;
        }

        public void Watch(string? servingEncoderId, string? activeEncoderId)
        {
            if (servingEncoderId == WatchedServing && activeEncoderId == WatchedActive)
            {
                return;
            }

            WatchedServing = servingEncoderId;
            WatchedActive = activeEncoderId;
            CoveredServing = CoveredActive = UncoveredNotQueued = 0;
            foreach (var key in References.Keys)
            {
                Join(key, 1);
            }
        }

        public IReadOnlyList<string> Differences(Tally fresh)
        {
            var differences = new List<string>();
            void Compare(string what, long running, long counted)
            {
                if (running != counted)
                {
                    differences.Add($"{what}: running {running}, counted {counted}");
                }
            }

            Compare("live documents", DocumentsLive, fresh.DocumentsLive);
            Compare("quarantined documents", DocumentsQuarantined, fresh.DocumentsQuarantined);
            Compare("unsupported documents", DocumentsUnsupported, fresh.DocumentsUnsupported);
            Compare("referenced pages", PagesReferenced, fresh.PagesReferenced);
            Compare("page locations", PageLocations, fresh.PageLocations);
            Compare("queued pages", QueuedAll, fresh.QueuedAll);
            foreach (var priority in Enum.GetValues<QueuePriority>())
            {
                Compare($"queued {priority} pages", Depths.GetValueOrDefault(priority), fresh.Depths.GetValueOrDefault(priority));
            }

            Compare("live vector sets", LiveVectorSets, fresh.LiveVectorSets);
            Compare("vector-set records not live", DeadVectorSets, fresh.DeadVectorSets);
            foreach (var kind in LiveKinds.Keys.Union(fresh.LiveKinds.Keys))
            {
                Compare($"live {kind} documents", LiveKinds.GetValueOrDefault(kind), fresh.LiveKinds.GetValueOrDefault(kind));
            }

            Compare("pages covered by the serving encoder", CoveredServing, fresh.CoveredServing);
            Compare("pages covered by the active encoder", CoveredActive, fresh.CoveredActive);
            Compare("pages neither covered nor queued", UncoveredNotQueued, fresh.UncoveredNotQueued);
            foreach (var root in Roots.Keys.Union(fresh.Roots.Keys, StringComparer.Ordinal))
            {
                if (Roots.GetValueOrDefault(root) != fresh.Roots.GetValueOrDefault(root))
                {
                    differences.Add($"root {root}: running {Roots.GetValueOrDefault(root)}, counted {fresh.Roots.GetValueOrDefault(root)}");
                }
            }

            return differences;
        }

        private void Add(DocumentShare share, int sign)
        {
            var live = share.State == DocumentState.Live;
            var quarantined = share.State == DocumentState.Quarantined;
            DocumentsLive += live ? sign : 0;
            LiveKinds[share.Kind] = LiveKinds.GetValueOrDefault(share.Kind) + (live ? sign : 0);
            DocumentsQuarantined += quarantined ? sign : 0;
            DocumentsUnsupported += share.Unsupported ? sign : 0;
            var sums = Roots.GetValueOrDefault(share.Root);
            Roots[share.Root] = new RootSums(
                sums.Documents + sign,
                sums.Live + (live ? sign : 0),
                sums.Quarantined + (quarantined ? sign : 0),
                sums.PageLocations + (live ? sign * share.Pages : 0),
                sums.Bytes + (live ? sign * share.Size : 0));
            if (Roots[share.Root].Documents == 0)
            {
                Roots.Remove(share.Root);
            }
        }
    }

    private readonly record struct DocumentShare(string Root, DocumentState State, bool Unsupported, int Pages, long Size, DocumentKind Kind);

    private readonly record struct RootSums(long Documents, long Live, long Quarantined, long PageLocations, long Bytes);
}
