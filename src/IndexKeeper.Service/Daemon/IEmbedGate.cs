namespace IndexKeeper.Service.Daemon;

/// <summary>Decides how much queued work the encoder may take now (windows and the daytime budget).</summary>
internal interface IEmbedGate
{
    EmbedAllowance Allowance(DateTimeOffset now);

    /// <summary>Tells the gate how many pages of which kind were just embedded (the budget spends them).</summary>
    void Spent(DateTimeOffset now, long pages);
}
