namespace IndexKeeper.Core.Storage;

/// <summary>
/// Writes a new seal over a sealed segment whose seal record is bad while every record before it is good
/// (the walk reaches the seal with no damage): the records are proven by their own CRC-32C, so only the 40
/// seal bytes are replaced, and the vectors are not touched. Run only by an explicit repair.
/// </summary>
public static class SegmentResealer
{
    /// <summary>Re-seals and returns null, or returns why the file cannot be re-sealed (and leaves it as it is).</summary>
    public static string? Reseal(string path)
    {
        SegmentScan scan;
        uint checksum;
        using (var reader = SegmentReader.Open(path))
        {
            scan = reader.Scan();
            var sealOffset = reader.Length - SegmentFormat.SealRecordLength;
            if (scan.End == SegmentEnd.Sealed)
            {
                return "its seal holds";
            }

            if (scan.End != SegmentEnd.Damaged || scan.DamageOffset != sealOffset)
            {
                return $"a record before the seal is not good ({scan.End} at byte {scan.ValidLength}{(scan.Problem is null ? string.Empty : ": " + scan.Problem)})";
            }

            checksum = reader.ChecksumOfPrefix(sealOffset);
        }

        Span<byte> seal = stackalloc byte[SegmentFormat.SealRecordLength];
        RecordCodec.EncodeSeal(seal, scan.Records.Count, scan.ValidLength, checksum);
        MakeWritable(path);
        using (var stream = new FileStream(path, FileMode.Open, FileAccess.Write, FileShare.Read))
        {
            stream.Position = scan.ValidLength;
            stream.Write(seal);
            stream.Flush(flushToDisk: true);
        }

        SegmentWriter.MakeReadOnly(path);
        return null;
    }

    private static void MakeWritable(string path)
    {
        if (OperatingSystem.IsWindows())
        {
            File.SetAttributes(path, File.GetAttributes(path) & ~FileAttributes.ReadOnly);
        }
        else
        {
            File.SetUnixFileMode(path, File.GetUnixFileMode(path) | UnixFileMode.UserWrite);
        }
    }
}
