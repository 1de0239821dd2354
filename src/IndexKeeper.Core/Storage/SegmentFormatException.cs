namespace IndexKeeper.Core.Storage;

/// <summary>
/// A segment file (or one record in it) is not what the format says: wrong magic, unknown version, bad
/// checksum, truncated or malformed. The bytes concerned are never returned as data.
/// </summary>
public sealed class SegmentFormatException : IOException
{
    public SegmentFormatException(string segmentPath, long? offset, string problem)
        : base(offset is { } at ? $"{segmentPath} at byte {at}: {problem}" : $"{segmentPath}: {problem}")
    {
        SegmentPath = segmentPath;
        Offset = offset;
        Problem = problem;
    }

    public string SegmentPath { get; }

    /// <summary>The offset of the bad record, or null when the file as a whole is bad (header, seal).</summary>
    public long? Offset { get; }

    public string Problem { get; }
}
