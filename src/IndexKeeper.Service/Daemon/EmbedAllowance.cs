using IndexKeeper.Core.Queue;

namespace IndexKeeper.Service.Daemon;

/// <summary>What the gate lets the encoder do now: at most this many pages, of priorities up to the given one.</summary>
internal sealed record EmbedAllowance(long MaxPages, QueuePriority LowestPriority, bool WindowOpen, DateTimeOffset? WindowEnd)
{
    /// <summary>Before the gate was first asked: nothing allowed, no window known.</summary>
    public static EmbedAllowance Initial { get; } = new(0, QueuePriority.Fresh, false, null);
}
