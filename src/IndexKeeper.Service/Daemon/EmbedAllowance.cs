using IndexKeeper.Core.Catalog;

namespace IndexKeeper.Service.Daemon;

/// <summary>What the gate lets the encoder do now: at most this many pages, of priorities up to the given one.</summary>
internal sealed record EmbedAllowance(long MaxPages, QueuePriority LowestPriority, bool WindowOpen, DateTimeOffset? WindowEnd)
{
    public static EmbedAllowance Everything { get; } = new(long.MaxValue, QueuePriority.Canary, true, null);
}
