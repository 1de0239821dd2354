namespace IndexKeeper.Core.Storage;

/// <summary>
/// Judges one segment file record by record, never as a whole (docs/segment-format.md, "Damage stays
/// local"): each location is proven by its own frame and record CRC-32C, so a bad record costs that record
/// only, and a bad seal over intact records costs nothing. Only reads.
/// </summary>
public static class SegmentInspector
{
    /// <param name="readRecords">
    /// True (verify): every record is read and its checksums checked, and an expected seal is checked over
    /// the whole file. False (status, health): only what costs no reading of vectors — the file is there,
    /// its header holds, and it is long enough for every location.
    /// </param>
    public static SegmentInspection Inspect(string path, long segmentId, IReadOnlyList<RecordLocation> locations, bool expectSeal, bool readRecords)
    {
        ArgumentNullException.ThrowIfNull(path);
        ArgumentNullException.ThrowIfNull(locations);
        if (!File.Exists(path))
        {
            return AllLost(missing: true, null, $"segment file {Path.GetFileName(path)} is missing");
        }

        SegmentReader reader;
        try
        {
            reader = SegmentReader.Open(path);
        }
        catch (Exception ex) when (ex is SegmentFormatException or IOException or UnauthorizedAccessException)
        {
            return AllLost(missing: false, null, ex.Message);
        }

        using (reader)
        {
            if (reader.Header.SegmentId != segmentId)
            {
                return AllLost(missing: false, reader.Header, $"{path}: the header names segment {reader.Header.SegmentId}");
            }

            var unreadable = new List<UnreadableRecord>();
            for (var i = 0; i < locations.Count; i++)
            {
                var problem = readRecords ? ReadProblem(reader, locations[i]) : LengthProblem(reader, locations[i]);
                if (problem is not null)
                {
                    unreadable.Add(new UnreadableRecord(i, locations[i], problem));
                }
            }

            var sealProblem = expectSeal && readRecords ? reader.SealProblem() : null;
            return new SegmentInspection(false, reader.Header, null, unreadable, sealProblem);
        }

        SegmentInspection AllLost(bool missing, SegmentHeader? header, string problem) =>
            new(missing, header, problem, locations.Select((l, i) => new UnreadableRecord(i, l, problem)).ToList(), null);
    }

    private static string? ReadProblem(SegmentReader reader, RecordLocation location)
    {
        try
        {
            reader.Read(location);
            return null;
        }
        catch (Exception ex) when (ex is SegmentFormatException or ArgumentException)
        {
            return ex.Message;
        }
    }

    private static string? LengthProblem(SegmentReader reader, RecordLocation location) =>
        location.Offset + location.Length <= reader.Length
            ? null
            : $"{reader.Path}: the record at byte {location.Offset} ends at {location.Offset + location.Length}, the file has {reader.Length} bytes";
}
