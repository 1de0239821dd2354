namespace IndexKeeper.Core.Encoding.TextTokens;

/// <summary>
/// Settings of the text-token encoder (docs/encoders.md). All but <see cref="IntraOpThreads"/> change the
/// vectors and so are part of the encoder id; <see cref="Validate"/> reports every bad setting at once.
/// </summary>
public sealed class TextTokenEncoderOptions
{
    /// <summary>The model's hidden size: the width of its per-token states, before projection.</summary>
    public const int HiddenSize = 384;

    /// <summary>The model's position limit (its position-embedding table): no window may be longer.</summary>
    public const int ModelPositionLimit = 512;

    /// <summary>Output size d; a multiple of 64 (sign codes are 64-bit words), at most the hidden size (the projection is orthonormal).</summary>
    public int Dimensions { get; set; } = 128;

    /// <summary>Seed of the projection matrix from the hidden size down to d; two seeds give two unrelated encoders.</summary>
    public ulong ProjectionSeed { get; set; } = 1;

    /// <summary>Tokens per model run, [CLS] and [SEP] included: the sequence length the model was tuned for.</summary>
    public int MaxSequenceLength { get; set; } = 256;

    /// <summary>Word-piece tokens two consecutive windows of a long page share, so no token sits at a cut.</summary>
    public int WindowOverlap { get; set; } = 32;

    /// <summary>Page vectors per pooled vector (1 = no pooling); see docs/encoders.md.</summary>
    public int PoolFactor { get; set; } = 1;

    /// <summary>Threads inside one model run; 0 lets the runtime choose (one per core). Does not change the vectors.</summary>
    public int IntraOpThreads { get; set; } = 1;

    /// <summary>Windows of equal length run through the model together, at most this many at once (memory grows with it).</summary>
    public int MaxWindowsPerRun { get; set; } = 8;

    public IReadOnlyList<string> Validate()
    {
        var errors = new List<string>();
        if (Dimensions is < 64 or > HiddenSize || Dimensions % 64 != 0)
        {
            errors.Add($"{nameof(Dimensions)} must be a multiple of 64 from 64 to {HiddenSize}, got {Dimensions}.");
        }

        if (MaxSequenceLength is < 16 or > ModelPositionLimit)
        {
            errors.Add($"{nameof(MaxSequenceLength)} must be from 16 to {ModelPositionLimit}, got {MaxSequenceLength}.");
        }

        var capacity = MaxSequenceLength - 2;
        if (WindowOverlap < 0 || WindowOverlap > capacity / 2)
        {
            errors.Add($"{nameof(WindowOverlap)} must be from 0 to half of {nameof(MaxSequenceLength)} - 2 ({Math.Max(0, capacity / 2)}), got {WindowOverlap}.");
        }

        if (PoolFactor is < 1 or > 64)
        {
            errors.Add($"{nameof(PoolFactor)} must be from 1 (off) to 64, got {PoolFactor}.");
        }

        if (IntraOpThreads is < 0 or > 256)
        {
            errors.Add($"{nameof(IntraOpThreads)} must be from 0 (runtime's choice) to 256, got {IntraOpThreads}.");
        }

        if (MaxWindowsPerRun is < 1 or > 256)
        {
            errors.Add($"{nameof(MaxWindowsPerRun)} must be from 1 to 256, got {MaxWindowsPerRun}.");
        }

        return errors;
    }
}
