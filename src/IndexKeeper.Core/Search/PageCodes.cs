using System.Runtime.InteropServices;

namespace IndexKeeper.Core.Search;

/// <summary>
/// Every live page's sign codes, kept page by page in one array (docs/search.md, "Serving view"): the first stage of
/// a search scores a page by Hamming MaxSim over its rows read in order, so scoring every page reads memory once,
/// front to back, and never touches the segments. The serving view of <c>All</c> holds one; the centroid lists
/// keep theirs in one too (positions there are list entries).
/// </summary>
/// <remarks>
/// A page is a slot: its id, first row and row count. Removes leave a dead slot until a quarter of the slots are
/// dead (<see cref="CompactionDue"/>); the owner then calls <see cref="Compact"/>, which moves the live rows down in
/// their order. Not safe for a write beside any other call: the serving view's lock orders them.
/// </remarks>
internal sealed class PageCodes
{
    private readonly int dimensions;
    private readonly int words;
    private readonly Dictionary<ulong, int> slotOf = [];

    // Per slot (a page as added; removed ones are dead until compaction): id, alive, first row, row count.
    private List<ulong> idOf = [];
    private List<bool> alive = [];
    private List<int> startOf = [];
    private List<int> rowsOf = [];

    // Row r's code is codes[r·words .. (r+1)·words): pages' rows side by side, in slot order.
    private ulong[] codes = [];
    private int dead;

    public PageCodes(int dimensions)
    {
        ArgumentOutOfRangeException.ThrowIfNegativeOrZero(dimensions);
        this.dimensions = dimensions;
        words = SignCodes.WordsPerCode(dimensions);
    }

    public int Dimensions => dimensions;

    /// <summary>Live pages.</summary>
    public int Count => slotOf.Count;

    /// <summary>Pages in slot order (removed ones included until compaction; <see cref="IsLive"/> tells).</summary>
    public int Slots => idOf.Count;

    /// <summary>Rows held, dead pages' included until compaction.</summary>
    public int Rows { get; private set; }

    /// <summary>Rows the arrays have room for: owners of per-row arrays of their own keep them this long.</summary>
    public int Capacity => codes.Length / words;

    /// <summary>Rows of the live pages.</summary>
    public long LiveRows => (long)Rows * Count / Math.Max(1, Slots);

    /// <summary>Bytes held: per row its code, per slot its fields and map entry (the room past the rows is not written until used).</summary>
    public long BytesEstimate => (Rows * words * 8L) + (idOf.Capacity * 17L) + (slotOf.Count * 24L);

    /// <summary>True when enough slots are dead that <see cref="Compact"/> is worth its copy.</summary>
    public bool CompactionDue => dead > Math.Max(1024, idOf.Count / 4);

    /// <summary>
    /// Page codes as the serving view file keeps them: per page its id and row count in slot order, then every row's
    /// code in the same order: the first <paramref name="stored"/> rows of <paramref name="codes"/>, whose words past
    /// them are room for the rows commits add (<see cref="WithRoom"/>).
    /// </summary>
    /// <exception cref="FormatException">The parts do not fit together.</exception>
    public static PageCodes Restore(int dimensions, ulong[] ids, int[] rows, ulong[] codes, int stored)
    {
        ArgumentNullException.ThrowIfNull(ids);
        ArgumentNullException.ThrowIfNull(rows);
        ArgumentNullException.ThrowIfNull(codes);
        var restored = new PageCodes(dimensions);
        if (ids.Length != rows.Length || stored < 0 || (long)stored * restored.words > codes.Length)
        {
            throw new FormatException($"{ids.Length} pages with {rows.Length} row counts, {stored} rows in {codes.Length} code words.");
        }

        restored.idOf = new List<ulong>(ids.Length);
        restored.alive = new List<bool>(ids.Length);
        restored.startOf = new List<int>(ids.Length);
        restored.rowsOf = new List<int>(ids.Length);
        long at = 0;
        for (var slot = 0; slot < ids.Length; slot++)
        {
            if (rows[slot] < 0 || at + rows[slot] > stored || !restored.slotOf.TryAdd(ids[slot], slot))
            {
                throw new FormatException($"Page {ids[slot]} has {rows[slot]} rows past the stored ones, or is there twice.");
            }

            restored.idOf.Add(ids[slot]);
            restored.alive.Add(true);
            restored.startOf.Add((int)at);
            restored.rowsOf.Add(rows[slot]);
            at += rows[slot];
        }

        if (at != stored)
        {
            throw new FormatException($"The pages have {at} rows, {stored} are stored.");
        }

        restored.codes = codes;
        restored.Rows = stored;
        return restored;
    }

    public bool IsLive(int slot) => alive[slot];

    public ulong IdOf(int slot) => idOf[slot];

    /// <summary>The first row of the page in <paramref name="slot"/>.</summary>
    public int StartOf(int slot) => startOf[slot];

    /// <summary>The row count of the page in <paramref name="slot"/>.</summary>
    public int RowsOf(int slot) => rowsOf[slot];

    /// <summary>The sign codes of the page in <paramref name="slot"/>, d / 64 words per row.</summary>
    public ReadOnlySpan<ulong> CodesOf(int slot) => codes.AsSpan(startOf[slot] * words, rowsOf[slot] * words);

    /// <summary>The code words of every row, d / 64 per row (list scans read them by row).</summary>
    public ulong[] AllCodes => codes;

    /// <summary>True when the page is held.</summary>
    public bool Contains(ulong id) => slotOf.ContainsKey(id);

    /// <summary>The slot of a held page.</summary>
    public int SlotOf(ulong id) => slotOf[id];

    /// <summary>Adds a page of <paramref name="rows"/> rows (a page held under the id is removed first); returns its slot.</summary>
    public int Add(ulong id, ReadOnlySpan<ulong> signCodes, int rows)
    {
        ArgumentOutOfRangeException.ThrowIfNegative(rows);
        if (signCodes.Length < rows * words)
        {
            throw new ArgumentException($"{rows} rows need {rows * words} code words, {signCodes.Length} were given.", nameof(signCodes));
        }

        Remove(id);
        var slot = idOf.Count;
        idOf.Add(id);
        alive.Add(true);
        startOf.Add(Rows);
        rowsOf.Add(rows);
        slotOf[id] = slot;
        Reserve(Rows + rows);
        signCodes[..(rows * words)].CopyTo(codes.AsSpan(Rows * words));
        Rows += rows;
        return slot;
    }

    /// <summary>Marks the page dead (its rows stay until <see cref="Compact"/>); nothing when it is not held.</summary>
    public void Remove(ulong id)
    {
        if (slotOf.Remove(id, out var slot))
        {
            alive[slot] = false;
            dead++;
        }
    }

    /// <summary>
    /// Drops the dead slots: live slots and their rows move down in their order. <paramref name="moved"/> hears each
    /// live page's move (old first row, new first row, row count, new slot) before the next one, so per-row arrays
    /// of the owner can follow with the same copy.
    /// </summary>
    public void Compact(Action<int, int, int, int>? moved = null)
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
            codes.AsSpan(from * words, length * words).CopyTo(codes.AsSpan(kept * words));
            moved?.Invoke(from, kept, length, ids.Count);
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
        Rows = kept;
        dead = 0;
    }

    /// <summary>
    /// Ids of the <paramref name="count"/> pages with the best Hamming MaxSim of <paramref name="queryCodes"/> (a query's
    /// tokens' sign codes) over all their rows, among the given slots (every live slot when null; a slot for which
    /// <paramref name="include"/> says no is skipped; a page without rows has no score and is never among them). Best
    /// first, ties to the earlier of the given slots. Both cores.
    /// </summary>
    /// <param name="visit">Positions in <paramref name="slots"/> in the order to score them, when that is not theirs:
    /// slots ascending, so the rows are read front to back whatever order breaks the ties (ignored with a filter).</param>
    public ulong[] Best(ulong[] queryCodes, int count, int[]? slots, Func<ulong, bool>? include, CancellationToken cancellationToken, int[]? visit = null)
    {
        ArgumentNullException.ThrowIfNull(queryCodes);
        slots ??= [.. Enumerable.Range(0, Slots).Where(s => alive[s])];
        if (include is not null)
        {
            slots = [.. slots.Where(s => include(idOf[s]))];
            visit = null;
        }

        var tokens = queryCodes.Length / words;
        var ordinals = visit ?? Enumerable.Range(0, slots.Length).ToArray();
        var top = LateInteractionSearch.Scan(ordinals, count, Environment.ProcessorCount, cancellationToken, () => new int[tokens], static _ => { }, (ordinal, closest, best) =>
        {
            var slot = slots[ordinal];
            if (rowsOf[slot] > 0)
            {
                best.Offer(MaxSimKernels.Hamming(queryCodes, codes.AsSpan(startOf[slot] * words, rowsOf[slot] * words), dimensions, closest), ordinal);
            }
        });
        return [.. top.Select(t => idOf[slots[t.Ordinal]])];
    }

    /// <summary>
    /// A page's <paramref name="rows"/> codes of <paramref name="dimensions"/> bits with repeated rows left out, the
    /// first of each kept in order. A page's Hamming MaxSim takes each query token's best row, and a row seen twice
    /// cannot be better the second time, so the distinct rows give every page the same first-stage score for fewer
    /// bytes read (a word a page repeats has the same vector with a term encoder).
    /// </summary>
    public static (ulong[] Codes, int Rows) Distinct(ReadOnlySpan<ulong> signCodes, int rows, int dimensions)
    {
        var words = dimensions / 64;
        var all = signCodes[..(rows * words)].ToArray();
        var seen = new HashSet<int>(rows, new RowComparer(all, words));
        var kept = Enumerable.Range(0, rows).Where(seen.Add).ToList();
        if (kept.Count == rows)
        {
            return (all, rows);
        }

        var distinct = new ulong[kept.Count * words];
        for (var i = 0; i < kept.Count; i++)
        {
            all.AsSpan(kept[i] * words, words).CopyTo(distinct.AsSpan(i * words));
        }

        return (distinct, kept.Count);
    }

    /// <summary>
    /// The rows an array for <paramref name="rows"/> rows has room for: an eighth more. A growth copies the array while
    /// the old one is still held (at 100,000 pages 210 MB more resident, then garbage for the collector), so a view read
    /// from its file or built keeps room for the commits of a while; the room is never written until used, so it costs
    /// address space, not resident memory.
    /// </summary>
    public static long WithRoom(long rows) => rows + Math.Max(1024, rows / 8);

    /// <summary>
    /// Room for <paramref name="rows"/> rows, and the room of <see cref="WithRoom"/> beyond them, at once: a build that
    /// knows its vectors takes the array it needs instead of growing one, and an add past the room grows it the same way.
    /// </summary>
    public void Reserve(long rows)
    {
        if (rows > Capacity)
        {
            // Not zeroed: only the rows held are ever read, and untouched room stays out of resident memory.
            var grown = GC.AllocateUninitializedArray<ulong>(checked((int)(WithRoom(rows) * words)));
            codes.AsSpan(0, Rows * words).CopyTo(grown);
            codes = grown;
        }
    }

    /// <summary>Rows of one code array compared by their words.</summary>
    private sealed class RowComparer(ulong[] codes, int words) : IEqualityComparer<int>
    {
        public bool Equals(int x, int y) => codes.AsSpan(x * words, words).SequenceEqual(codes.AsSpan(y * words, words));

        public int GetHashCode(int obj)
        {
            var hash = new HashCode();
            hash.AddBytes(MemoryMarshal.AsBytes(codes.AsSpan(obj * words, words)));
            return hash.ToHashCode();
        }
    }
}
