namespace IndexKeeper.Core.Catalog;

/// <summary>Where a page's words lie in the page-word store (docs/page-words-format.md): file id, frame offset and length, body CRC-32C.</summary>
public sealed class WordsAtRecord
{
    public long File { get; set; }

    public long Offset { get; set; }

    public int Length { get; set; }

    /// <summary>The body's CRC-32C (unsigned 32-bit value, widened).</summary>
    public long Checksum { get; set; }
}
