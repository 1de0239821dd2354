namespace IndexKeeper.Core.Queue;

/// <summary>Pages waiting in the queue (and due, past any back-off), by priority.</summary>
public readonly record struct QueuedPages(long Fresh, long Migration, long Canary)
{
    public long Total => Fresh + Migration + Canary;

    public long Of(QueuePriority priority) => priority switch
    {
        QueuePriority.Fresh => Fresh,
        QueuePriority.Migration => Migration,
        QueuePriority.Canary => Canary,
        _ => throw new ArgumentOutOfRangeException(nameof(priority), priority, "Unknown queue priority."),
    };

    /// <summary>Takes up to <paramref name="pages"/> in priority order (Fresh, then Migration, then Canary).</summary>
    public QueuedPages Take(long pages, out long taken)
    {
        ArgumentOutOfRangeException.ThrowIfNegative(pages);
        var fresh = Math.Min(Fresh, pages);
        var migration = Math.Min(Migration, pages - fresh);
        var canary = Math.Min(Canary, pages - fresh - migration);
        taken = fresh + migration + canary;
        return new QueuedPages(Fresh - fresh, Migration - migration, Canary - canary);
    }
}
