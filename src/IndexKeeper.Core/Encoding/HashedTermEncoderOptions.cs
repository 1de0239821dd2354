namespace IndexKeeper.Core.Encoding;

/// <summary>
/// Settings of the hashed-term encoder. Every setting changes the vectors and so is part of the encoder id;
/// <see cref="Validate"/> reports every bad setting at once.
/// </summary>
public sealed class HashedTermEncoderOptions
{
    /// <summary>Output size d; a multiple of 64 because sign codes are stored in 64-bit words.</summary>
    public int Dimensions { get; set; } = 128;

    /// <summary>Signed buckets each feature sets (k hash probes); more probes flatten the tail of chance similarities.</summary>
    public int Probes { get; set; } = 16;

    /// <summary>Length of the character n-grams added as features of each term; 0 turns them off.</summary>
    public int CharacterNGramLength { get; set; }

    /// <summary>Seed mixed into every hash; two seeds give two unrelated encoders.</summary>
    public ulong Seed { get; set; }

    /// <summary>Page vectors per pooled vector (1 = no pooling); see docs/encoders.md.</summary>
    public int PoolFactor { get; set; } = 1;

    public IReadOnlyList<string> Validate()
    {
        var errors = new List<string>();
        if (Dimensions is < 64 or > 4096 || Dimensions % 64 != 0)
        {
            errors.Add($"{nameof(Dimensions)} must be a multiple of 64 from 64 to 4096, got {Dimensions}.");
        }

        if (Probes < 1 || Probes > Math.Max(Dimensions, 1))
        {
            errors.Add($"{nameof(Probes)} must be from 1 to {nameof(Dimensions)} ({Dimensions}), got {Probes}.");
        }

        if (CharacterNGramLength is < 0 or 1 or > 8)
        {
            errors.Add($"{nameof(CharacterNGramLength)} must be 0 (off) or from 2 to 8, got {CharacterNGramLength}.");
        }

        if (PoolFactor is < 1 or > 64)
        {
            errors.Add($"{nameof(PoolFactor)} must be from 1 (off) to 64, got {PoolFactor}.");
        }

        return errors;
    }
}
