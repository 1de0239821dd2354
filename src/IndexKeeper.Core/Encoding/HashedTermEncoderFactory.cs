using System.Globalization;
using System.Security.Cryptography;

namespace IndexKeeper.Core.Encoding;

/// <summary>Builds the training-free hashed-term encoder (docs/encoders.md) from validated options.</summary>
public static class HashedTermEncoderFactory
{
    public const string Name = "hashed-terms";

    /// <summary>
    /// Version of the hashing scheme; raise it on any change that alters vectors. Never reuse a number.
    /// 1: one term per white-space word. 2: a word's terms are its UAX #29 words and, when there are several, the
    /// whole word as well (docs/encoders.md).
    /// </summary>
    public const int SchemeVersion = 2;

    /// <exception cref="ArgumentException">One or more settings are bad; the message names each.</exception>
    public static IPageEncoder Create(HashedTermEncoderOptions options)
    {
        ArgumentNullException.ThrowIfNull(options);
        var errors = options.Validate();
        if (errors.Count > 0)
        {
            throw new ArgumentException("Bad hashed-term encoder settings: " + string.Join(" ", errors), nameof(options));
        }

        return new HashedTermEncoder(Identify(options), options.Dimensions, options.Probes, options.CharacterNGramLength, options.Seed, options.PoolFactor);
    }

    /// <summary>The canonical description names every input of the vectors; the id is its SHA-256.</summary>
    internal static EncoderIdentity Identify(HashedTermEncoderOptions options)
    {
        var description = string.Create(
            CultureInfo.InvariantCulture,
            $"{Name};scheme={SchemeVersion};hash=fnv1a64;unicode={UnicodeTables.Version};normalise=nfkc+casefold+letters-marks-digits;terms=uax29-words+whole;" +
            $"dimensions={options.Dimensions};probes={options.Probes};ngram={options.CharacterNGramLength};seed={options.Seed};pool={options.PoolFactor};" +
            $"pooling={VectorPooling.Scheme};stored={Storage.VectorQuantization.StoredForm}");
        var id = Convert.ToHexStringLower(SHA256.HashData(System.Text.Encoding.UTF8.GetBytes(description)));
        return new EncoderIdentity(id, Name, description, options.Dimensions);
    }
}
