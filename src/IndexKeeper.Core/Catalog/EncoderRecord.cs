namespace IndexKeeper.Core.Catalog;

/// <summary>An encoder that produced vectors in this index (collection <c>encoders</c>).</summary>
public sealed class EncoderRecord
{
    /// <summary>The encoder id: hex fingerprint of everything that changes its vectors.</summary>
    public string Id { get; set; } = string.Empty;

    public string Name { get; set; } = string.Empty;

    public string Description { get; set; } = string.Empty;

    public int Dimensions { get; set; }

    public DateTime FirstUsedUtc { get; set; }
}
