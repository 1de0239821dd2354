namespace IndexKeeper.Core.Catalog;

/// <summary>
/// The keys of documents, pages, queue entries and vector sets a write of this process touched since
/// <see cref="RunningCounts"/> last read them. Marking more than changed costs a record read and nothing else (the
/// counts re-read each marked record as it is now, so a rolled-back transaction's marks are harmless); a write
/// that changes a counted field without a mark would let the counts drift, which the periodic recount reports.
/// Nothing is gathered until the counts are first taken (<see cref="Restart"/>): a command that never asks for
/// them, a long <c>sync</c> say, does not hold every key it wrote.
/// </summary>
internal sealed class CatalogMarks
{
    private readonly Lock gate = new();
    private HashSet<string> documents = new(StringComparer.Ordinal);
    private HashSet<string> pages = new(StringComparer.Ordinal);
    private HashSet<string> queue = new(StringComparer.Ordinal);
    private Dictionary<string, (string EncoderId, string PageKey)> vectorSets = new(StringComparer.Ordinal);
    private bool gathering;

    public void Document(string id) => Mark(static (marks, key) => marks.documents.Add(key), id);

    public void Page(string key) => Mark(static (marks, k) => marks.pages.Add(k), key);

    public void Queued(string key) => Mark(static (marks, k) => marks.queue.Add(k), key);

    public void VectorSet(VectorSetRecord set) => Mark(static (marks, s) => marks.vectorSets[s.Id] = (s.EncoderId, s.PageKey), set);

    // One lock and one "gathering?" test for every kind of mark; the sets are read inside the lock because Take swaps them.
    private void Mark<T>(Action<CatalogMarks, T> add, T item)
    {
        lock (gate)
        {
            if (gathering)
            {
                add(this, item);
            }
        }
    }

    /// <summary>Drops the marks gathered so far and gathers from now on: the caller counts everything next.</summary>
    public void Restart()
    {
        lock (gate)
        {
            gathering = true;
            documents.Clear();
            pages.Clear();
            queue.Clear();
            vectorSets.Clear();
        }
    }

    /// <summary>Hands over the marks gathered so far and starts a new gathering.</summary>
    public (HashSet<string> Documents, HashSet<string> Pages, HashSet<string> Queue, Dictionary<string, (string EncoderId, string PageKey)> VectorSets) Take()
    {
        lock (gate)
        {
            var taken = (documents, pages, queue, vectorSets);
            documents = new(StringComparer.Ordinal);
            pages = new(StringComparer.Ordinal);
            queue = new(StringComparer.Ordinal);
            vectorSets = new(StringComparer.Ordinal);
            return taken;
        }
    }
}
