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

    /// <summary>
    /// Seals a segment that has no seal and a damaged record, for a catalog rebuild that takes its good records
    /// back: a damaged file can never be appended to again, so it is closed as it is. The seal is appended after
    /// the last byte (zero-padded to 8), covers every byte before it, and counts the good records on both sides
    /// of the damage; no byte already in the file changes. Returns null, or why it was left as it is.
    /// </summary>
    public static string? SealAfterDamage(string path)
    {
        long length;
        int records;
        uint checksum;
        using (var reader = SegmentReader.Open(path))
        {
            var scan = reader.Scan();
            if (scan.End != SegmentEnd.Damaged || reader.IsSealed || scan.DamageOffset == reader.Length - SegmentFormat.SealRecordLength)
            {
                return "it is not an unsealed segment with a damaged record";
            }

            length = reader.Length;
            records = scan.Records.Count + scan.RecordsAfterDamage.Count;
            checksum = reader.ChecksumOfPrefix(length);
        }

        // Zero padding to the 8-byte boundary a record (here the seal) starts on, then the seal over both.
        var tail = new byte[((SegmentFormat.Alignment - (int)(length % SegmentFormat.Alignment)) % SegmentFormat.Alignment) + SegmentFormat.SealRecordLength];
        var sealOffset = length + tail.Length - SegmentFormat.SealRecordLength;
        checksum = Crc32C.Append(checksum, tail.AsSpan(0, (int)(sealOffset - length)));
        RecordCodec.EncodeSeal(tail.AsSpan((int)(sealOffset - length)), records, sealOffset, checksum);
        MakeWritable(path);
        using (var stream = new FileStream(path, FileMode.Open, FileAccess.Write, FileShare.Read))
        {
            stream.Position = length;
            stream.Write(tail);
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
