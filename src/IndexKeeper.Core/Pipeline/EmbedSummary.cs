namespace IndexKeeper.Core.Pipeline;

/// <summary>What one embed pass did.</summary>
public sealed class EmbedSummary
{
    /// <summary>Encoder page calls made and committed.</summary>
    public long PagesEmbedded { get; set; }

    public long VectorsWritten { get; set; }

    /// <summary>Wall time inside the encoder's calls.</summary>
    public double EncoderSeconds { get; set; }

    /// <summary>Pages whose batch failed; they stay queued with a back-off.</summary>
    public long PagesFailed { get; set; }

    public List<string> Problems { get; } = [];
}
