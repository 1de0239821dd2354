namespace IndexKeeper.Core.Catalog;

/// <summary>A page key waiting for vectors under the active encoder (collection <c>queue</c>).</summary>
public sealed class QueueRecord
{
    /// <summary>The page key; one entry per key.</summary>
    public string Id { get; set; } = string.Empty;

    public QueuePriority Priority { get; set; }

    public DateTime EnqueuedUtc { get; set; }

    public int Attempts { get; set; }

    public DateTime NotBeforeUtc { get; set; }
}
