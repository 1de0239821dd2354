using IndexKeeper.Core.Queue;
using LiteDB;

namespace IndexKeeper.Core.Catalog;

/// <summary>The persistent embed queue: page keys waiting for vectors, with priority, attempts and back-off.</summary>
public sealed class QueueTable
{
    private readonly ILiteCollection<QueueRecord> queue;
    private readonly CatalogMarks marks;

    internal QueueTable(CatalogStore store)
    {
        queue = store.Queue;
        marks = store.Marks;
    }

    public IEnumerable<QueueRecord> InOrder() => queue.Query().OrderBy(q => q.Priority).ToEnumerable();

    /// <summary>Queued page keys with their priority.</summary>
    public IReadOnlyList<(string PageKey, QueuePriority Priority)> Keys() =>
        queue.FindAll().Select(q => (q.Id, q.Priority)).ToList();

    /// <summary>Up to <paramref name="count"/> queued pages that may be tried now, highest priority first.</summary>
    public IReadOnlyList<QueueRecord> Next(int count, DateTime nowUtc) =>
        queue.Query().Where(q => q.NotBeforeUtc <= nowUtc).OrderBy(q => q.Priority).Limit(count).ToList();

    /// <summary>Up to <paramref name="count"/> due queued pages of the priorities a gate decision allows, highest first.</summary>
    public IReadOnlyList<QueueRecord> Next(int count, DateTime nowUtc, IReadOnlyCollection<QueuePriority> allowed)
    {
        ArgumentNullException.ThrowIfNull(allowed);
        if (allowed.Count == 0)
        {
            return [];
        }

        // The gate allows a prefix of the priorities (fresh; or all), so one bound selects them.
        var lowest = allowed.Max();
        return queue.Query().Where(q => q.NotBeforeUtc <= nowUtc && q.Priority <= lowest).OrderBy(q => q.Priority).Limit(count).ToList();
    }

    /// <summary>Queued pages by priority, quarantined pages apart (they wait for their document to change).</summary>
    public IReadOnlyDictionary<QueuePriority, long> Depths() =>
        Enum.GetValues<QueuePriority>().ToDictionary(p => p, p => queue.LongCount(q => q.Priority == p && q.QuarantinedUtc == null));

    /// <summary>Queued pages by priority that may be tried at <paramref name="nowUtc"/> (past their back-off): what the gate is asked about.</summary>
    public QueuedPages Due(DateTime nowUtc) => new(
        queue.LongCount(q => q.Priority == QueuePriority.Fresh && q.NotBeforeUtc <= nowUtc),
        queue.LongCount(q => q.Priority == QueuePriority.Migration && q.NotBeforeUtc <= nowUtc),
        queue.LongCount(q => q.Priority == QueuePriority.Canary && q.NotBeforeUtc <= nowUtc));

    /// <summary>Pages quarantined after repeated encoder failures, with their last error.</summary>
    public IReadOnlyList<QueueRecord> Quarantined() => queue.Find(q => q.QuarantinedUtc != null).ToList();

    /// <summary>Removes queue entries whose page already has vectors (nothing to encode).</summary>
    public void Remove(IEnumerable<string> pageKeys)
    {
        ArgumentNullException.ThrowIfNull(pageKeys);
        foreach (var key in pageKeys)
        {
            queue.Delete(key);
            marks.Queued(key);
        }
    }

    /// <summary>Records the failed attempt of a page and when it may be tried again.</summary>
    public void Defer(string pageKey, DateTime notBeforeUtc)
    {
        if (queue.FindById(pageKey) is { } entry)
        {
            entry.Attempts++;
            entry.NotBeforeUtc = notBeforeUtc;
            queue.Update(entry);
        }
    }

    /// <summary>
    /// Records a failed attempt with its reason: the page is tried again at <paramref name="nextTryUtc"/>,
    /// or quarantined when that is null. Returns the page's failed attempts so far (0 when it is no longer queued).
    /// </summary>
    public int RecordFailure(string pageKey, Func<int, DateTime?> nextTryUtc, string reason, DateTime nowUtc)
    {
        ArgumentNullException.ThrowIfNull(nextTryUtc);
        if (queue.FindById(pageKey) is not { } entry)
        {
            return 0;
        }

        entry.Attempts++;
        entry.LastError = reason;
        if (nextTryUtc(entry.Attempts) is { } next)
        {
            entry.NotBeforeUtc = next;
        }
        else
        {
            entry.NotBeforeUtc = QueueRecord.QuarantinedNotBefore;
            entry.QuarantinedUtc = nowUtc;
        }

        queue.Update(entry);
        marks.Queued(pageKey);
        return entry.Attempts;
    }
}
