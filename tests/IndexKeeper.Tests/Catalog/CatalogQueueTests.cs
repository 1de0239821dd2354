using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Queue;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Catalog;

/// <summary>The queue as the encoder gate sees it: due pages by priority, and the next pages of the allowed priorities.</summary>
public sealed class CatalogQueueTests
{
    [Fact]
    public void Due_queue_by_priority_and_the_next_pages_a_gate_decision_allows()
    {
        using var temp = new TempDirectory();
        using var held = IndexLock.Acquire(temp.Path, "test");
        using var catalog = IndexCatalog.Open(held);
        var now = new DateTime(2026, 12, 8, 10, 0, 0, DateTimeKind.Utc);
        var edit = new CatalogEdit();
        edit.Enqueue.Add(new QueueRecord { Id = "m1", Priority = QueuePriority.Migration, NotBeforeUtc = now });
        edit.Enqueue.Add(new QueueRecord { Id = "f1", Priority = QueuePriority.Fresh, NotBeforeUtc = now });
        edit.Enqueue.Add(new QueueRecord { Id = "f2", Priority = QueuePriority.Fresh, NotBeforeUtc = now.AddMinutes(5) }); // backing off
        edit.Enqueue.Add(new QueueRecord { Id = "c1", Priority = QueuePriority.Canary, NotBeforeUtc = now });
        catalog.Apply(edit);

        Assert.Equal(new QueuedPages(1, 1, 1), catalog.Queue.Due(now));
        Assert.Equal(new QueuedPages(2, 1, 1), catalog.Queue.Due(now.AddMinutes(5)));
        Assert.Equal(["f1"], catalog.Queue.Next(10, now, [QueuePriority.Fresh]).Select(q => q.Id));
        Assert.Equal(["f1", "m1", "c1"], catalog.Queue.Next(10, now, [QueuePriority.Fresh, QueuePriority.Migration, QueuePriority.Canary]).Select(q => q.Id));
        Assert.Equal(["f1", "m1"], catalog.Queue.Next(2, now, [QueuePriority.Fresh, QueuePriority.Migration, QueuePriority.Canary]).Select(q => q.Id));
        Assert.Empty(catalog.Queue.Next(10, now, []));
    }
}
