using System.Security.Cryptography;

namespace IndexKeeper.Core.Documents;

/// <summary>
/// The content address of one page: SHA-256 of the canonical form of what the page shows
/// (see docs/page-keys.md). Stored and printed as 64 lower-case hex digits.
/// </summary>
public readonly record struct PageKey
{
    public const int ByteLength = 32;

    private PageKey(string hex) => Hex = hex;

    public string Hex { get; }

    public static PageKey FromHash(ReadOnlySpan<byte> sha256)
    {
        if (sha256.Length != ByteLength)
        {
            throw new ArgumentException($"A page key is {ByteLength} bytes, got {sha256.Length}.", nameof(sha256));
        }

        return new PageKey(Convert.ToHexStringLower(sha256));
    }

    public static PageKey Parse(string hex)
    {
        ArgumentNullException.ThrowIfNull(hex);
        if (hex.Length != ByteLength * 2 || !hex.All(Uri.IsHexDigit))
        {
            throw new FormatException($"'{hex}' is not a page key (64 hex digits).");
        }

        return new PageKey(hex.ToLowerInvariant());
    }

    /// <summary>Hashes a canonical form produced by a page canonicalizer.</summary>
    public static PageKey Of(ReadOnlySpan<byte> canonicalForm) => FromHash(SHA256.HashData(canonicalForm));

    public byte[] ToBytes() => Convert.FromHexString(Hex);

    public override string ToString() => Hex;
}
