namespace IndexKeeper.Service.Configuration;

/// <summary>Which encoder is active, and its settings. A change of any setting is a new encoder id.</summary>
public sealed class EncoderOptions
{
    /// <summary>Built-in names: <c>hashed-terms</c>, <c>minilm</c>, <c>page-image</c>.</summary>
    public string Name { get; set; } = "hashed-terms";

    /// <summary>Output size d of every vector (a multiple of 64, for the sign codes).</summary>
    public int Dimensions { get; set; } = 128;

    /// <summary>Pages per encoder call.</summary>
    public int BatchSize { get; set; } = 32;

    /// <summary>Merge near-duplicate vectors of a page down to count/PoolFactor (1: no pooling).</summary>
    public int PoolFactor { get; set; } = 1;

    /// <summary>Threads inside one model run of a model-based encoder (0: one per core). Does not change the vectors.</summary>
    public int IntraOpThreads { get; set; } = 1;

    /// <summary>Settings of the <c>page-image</c> encoder; read only when it is the active one.</summary>
    public PageImageOptions PageImage { get; set; } = new();
}
