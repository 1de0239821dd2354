namespace IndexKeeper.Core.Storage;

/// <summary>
/// A location whose record cannot be read: the file is missing or unreadable, or the record fails its own
/// checks (frame and record CRC-32C, layout, encoder). Only this record is lost; the others stay readable.
/// </summary>
/// <param name="Index">The position of the location in the list the caller passed.</param>
public sealed record UnreadableRecord(int Index, RecordLocation Location, string Problem);
