using IndexKeeper.Core.Queue;

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

    /// <summary>The last encoder failure's message, when an attempt failed.</summary>
    public string? LastError { get; set; }

    /// <summary>
    /// Set when the page failed too often: it is then kept out of the work (<see cref="NotBeforeUtc"/> is
    /// <see cref="QuarantinedNotBefore"/>) until its document changes and the key goes away.
    /// </summary>
    public DateTime? QuarantinedUtc { get; set; }

    /// <summary>The not-before time of a quarantined page: later than any real time, so no query of due work finds it.</summary>
    public static DateTime QuarantinedNotBefore { get; } = new(9000, 1, 1, 0, 0, 0, DateTimeKind.Utc);
}
