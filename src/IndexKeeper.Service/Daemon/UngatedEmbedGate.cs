namespace IndexKeeper.Service.Daemon;

/// <summary>The gate when no schedule is configured: the encoder may take all queued work at any time.</summary>
internal sealed class UngatedEmbedGate : IEmbedGate
{
    public EmbedAllowance Allowance(DateTimeOffset now) => EmbedAllowance.Everything;

    public void Spent(DateTimeOffset now, long pages)
    {
    }
}
