namespace IndexKeeper.Core.Storage;

/// <summary>
/// Where one page's words lie in the page-word store (docs/page-words-format.md): file id, offset and length
/// of the record's frame, and the CRC-32C of its body. The catalog keeps it on the page's record.
/// </summary>
public readonly record struct PageWordsLocation(long File, long Offset, int Length, uint Checksum);
