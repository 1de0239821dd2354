using IndexKeeper.Core.Documents;

namespace IndexKeeper.Core.Diff;

/// <summary>
/// The pure bookkeeping of one scan: how many page locations of live documents hold each page key,
/// before and after the documents seen so far. Pages are content-addressed, so a copy, a move or a
/// reordered page changes counts but creates no new key.
/// </summary>
/// <remarks>
/// Callers tell the ledger the stored reference count of a key the first time they touch it
/// (<paramref name="knownReferences"/>), so the ledger needs no catalog. Keys are judged at the end:
/// a key whose count went to zero during the scan but came back (a move) is neither new nor removed.
/// </remarks>
public sealed class PageLedger
{
    private readonly Func<PageKey, int?> knownReferences;
    private readonly Dictionary<PageKey, Entry> entries = [];
    private readonly HashSet<PageKey> dirty = [];

    /// <param name="knownReferences">Stored reference count of a key, or null for a key the catalog has never seen.</param>
    public PageLedger(Func<PageKey, int?> knownReferences) => this.knownReferences = knownReferences;

    /// <summary>Page occurrences in new or changed documents whose key did not exist before (first occurrence only).</summary>
    public int PagesNew { get; private set; }

    /// <summary>Page occurrences in new or changed documents whose key already existed or was counted new earlier.</summary>
    public int PagesReused { get; private set; }

    /// <summary>
    /// Replaces a document's page list. Returns the keys that became referenced for the first time
    /// in this scan and were unknown before (they need encoding).
    /// </summary>
    public IReadOnlyList<PageKey> Replace(IReadOnlyList<PageKey> before, IReadOnlyList<PageKey> after)
    {
        foreach (var key in before)
        {
            Touch(key).Delta--;
        }

        var fresh = new List<PageKey>();
        foreach (var key in after)
        {
            var entry = Touch(key);
            entry.Delta++;
            if (entry.Before is null && !entry.CountedNew)
            {
                entry.CountedNew = true;
                PagesNew++;
                fresh.Add(key);
            }
            else
            {
                PagesReused++;
            }
        }

        return fresh;
    }

    /// <summary>
    /// Keys touched since the last call, with their count now and whether the catalog knew them before
    /// the scan; the caller writes these counts in the same transaction as the documents that moved them.
    /// </summary>
    public IReadOnlyList<(PageKey Key, int References, bool ExistedBefore)> TakeTouched()
    {
        var touched = new List<(PageKey, int, bool)>(dirty.Count);
        foreach (var key in dirty)
        {
            var entry = entries[key];
            touched.Add((key, (entry.Before ?? 0) + entry.Delta, entry.Before is not null));
        }

        dirty.Clear();
        return touched;
    }

    private Entry Touch(PageKey key)
    {
        if (!entries.TryGetValue(key, out var entry))
        {
            entry = new Entry { Before = knownReferences(key) };
            entries.Add(key, entry);
        }

        dirty.Add(key);
        return entry;
    }

    private sealed class Entry
    {
        public int? Before { get; init; }

        public int Delta { get; set; }

        public bool CountedNew { get; set; }
    }
}
