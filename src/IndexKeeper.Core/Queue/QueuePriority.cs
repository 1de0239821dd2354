namespace IndexKeeper.Core.Queue;

/// <summary>Order in which queued pages are embedded (lower first). Numbers reach the catalog: never change them.</summary>
public enum QueuePriority
{
    Fresh = 0,
    Migration = 1,
    Canary = 2,
}
