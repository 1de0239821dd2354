using IndexKeeper.Core.Encoding.PageImages;

namespace IndexKeeper.Service.Configuration;

/// <summary>Which encoder is active, and its settings. A change of any setting is a new encoder id.</summary>
public sealed class EncoderOptions
{
    /// <summary>Built-in names: <c>minilm</c> (the default: a pretrained text encoder), <c>hashed-terms</c> (training-free, fast), <c>page-image</c> (a configured ONNX page-image model).</summary>
    public string Name { get; set; } = "minilm";

    /// <summary>Output size d of every vector (a multiple of 64, for the sign codes).</summary>
    public int Dimensions { get; set; } = 128;

    /// <summary>Pages per encoder call.</summary>
    public int BatchSize { get; set; } = 32;

    /// <summary>Merge near-duplicate vectors of a page down to count/PoolFactor (1: no pooling).</summary>
    public int PoolFactor { get; set; } = 1;

    /// <summary>
    /// Threads inside one model run of a model-based encoder (0: one per core). Does not change the vectors.
    /// One per core by default: a page costs the same CPU time on 1 or 2 threads (docs/benchmarks.md,
    /// "minilm as the default"), so free cores only shorten the wall time; idle threads sleep, never spin.
    /// </summary>
    public int IntraOpThreads { get; set; }

    /// <summary>Settings of the <c>page-image</c> encoder; read only when it is the active one.</summary>
    public PageImageModelOptions PageImage { get; set; } = new();

    /// <summary>
    /// The settings above that the configuration gave (file, environment or command line), by name; the
    /// others an existing index supplies from its own encoder (<see cref="Application.EncoderChoice"/>).
    /// Null for options built in code: every setting counts as given. Not a setting itself.
    /// </summary>
    internal IReadOnlySet<string>? Given { get; set; }
}
