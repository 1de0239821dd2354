using System.Buffers.Binary;
using IndexKeeper.Core.Documents;

namespace IndexKeeper.Core.Storage;

/// <summary>
/// Reads one segment file through a memory map (format: docs/segment-format.md). Opening checks magic,
/// version and header checksum; every record read is checked against its location and checksums, and
/// bad bytes raise <see cref="SegmentFormatException"/> — they are never returned as data. Safe for
/// concurrent readers. Sees the file as long as it was when opened.
/// </summary>
public sealed class SegmentReader : IDisposable
{
    private readonly MappedFile file;
    private int disposed;

    private SegmentReader(MappedFile file, SegmentHeader header)
    {
        this.file = file;
        Header = header;
    }

    public string Path => file.Path;

    public SegmentHeader Header { get; }

    public long Length => file.Length;

    /// <summary>True when a good seal record ends the file (the whole-file checksum is checked by <see cref="Scan"/>).</summary>
    public bool IsSealed => HasSealAtEnd();

    public static SegmentReader Open(string path)
    {
        var file = MappedFile.Open(path);
        try
        {
            var header = SegmentHeader.Decode(file.Span(0, (int)Math.Min(file.Length, SegmentFormat.MaxHeaderLength)), path);
            return new SegmentReader(file, header);
        }
        catch
        {
            file.Release();
            throw;
        }
    }

    /// <summary>The vector set at <paramref name="location"/>; the spans point into the map and live as long as this reader.</summary>
    public StoredVectors Read(RecordLocation location)
    {
        var body = ReadRecord(location)[SegmentFormat.FrameLength..];
        var count = RecordCodec.CheckVectorSetBody(body, Header.Dimensions, out var problem);
        if (count < 0)
        {
            throw new SegmentFormatException(Path, location.Offset, problem);
        }

        return RecordCodec.View(body, Header.Dimensions, count, PageKey.FromHash(body[..PageKey.ByteLength]));
    }

    /// <summary>The whole record at <paramref name="location"/>, frame included, after every check.</summary>
    internal ReadOnlySpan<byte> ReadRecord(RecordLocation location)
    {
        ObjectDisposedException.ThrowIf(Volatile.Read(ref disposed) != 0, this);
        if (location.SegmentId != Header.SegmentId)
        {
            throw new ArgumentException($"location names segment {location.SegmentId}, this is segment {Header.SegmentId}", nameof(location));
        }

        if (location.Offset < Header.EncodedLength || location.Length < SegmentFormat.FrameLength || location.Offset > Length - location.Length)
        {
            throw new SegmentFormatException(Path, location.Offset, $"record of {location.Length} bytes lies outside the {Length}-byte file");
        }

        var record = file.Span(location.Offset, location.Length);
        var state = RecordCodec.Examine(record, out var type, out var recordLength, out var checksum, out var problem);
        if (state != RecordCodec.FrameState.Complete)
        {
            throw new SegmentFormatException(Path, location.Offset, state == RecordCodec.FrameState.Damaged ? problem : "record is incomplete");
        }

        if (type != SegmentFormat.RecordTypeVectorSet || recordLength != location.Length || checksum != location.Checksum)
        {
            throw new SegmentFormatException(Path, location.Offset, "the record here is not the one the location names (type, length or checksum differ)");
        }

        return record;
    }

    /// <summary>Walks every record from the header on; see <see cref="SegmentEnd"/> for how it can end.</summary>
    public SegmentScan Scan()
    {
        ObjectDisposedException.ThrowIf(Volatile.Read(ref disposed) != 0, this);
        var records = new List<ScannedRecord>();
        long offset = Header.EncodedLength;
        while (offset < Length)
        {
            var rest = file.Rest(offset);
            var state = RecordCodec.Examine(rest, out var type, out var recordLength, out var checksum, out var problem);
            if (state is RecordCodec.FrameState.Incomplete or RecordCodec.FrameState.ZeroFill)
            {
                return Result(SegmentEnd.TornTail, offset, null, null);
            }

            if (state == RecordCodec.FrameState.Damaged)
            {
                return Result(SegmentEnd.Damaged, offset, problem, offset);
            }

            var body = rest[SegmentFormat.FrameLength..recordLength];
            if (type == SegmentFormat.RecordTypeSeal)
            {
                var sealProblem = CheckSeal(body, offset, offset + recordLength, records.Count);
                return sealProblem is null
                    ? Result(SegmentEnd.Sealed, offset + recordLength, null, null)
                    : Result(SegmentEnd.Damaged, offset, sealProblem, offset);
            }

            var count = RecordCodec.CheckVectorSetBody(body, Header.Dimensions, out problem);
            if (count < 0)
            {
                return Result(SegmentEnd.Damaged, offset, problem, offset);
            }

            records.Add(new ScannedRecord(new RecordLocation(Header.SegmentId, offset, recordLength, checksum), PageKey.FromHash(body[..PageKey.ByteLength]), count));
            offset += recordLength;
        }

        return Result(SegmentEnd.Open, offset, null, null);

        SegmentScan Result(SegmentEnd end, long validLength, string? damage, long? at) =>
            new(Header, records, end, validLength, Length, damage, at, at is { } damagedAt ? RecordsPast(damagedAt) : []);
    }

    /// <summary>
    /// The good vector-set records after damage at <paramref name="damageOffset"/>: the walk steps 8 bytes at a
    /// time (every record starts on an 8-byte boundary) and takes a record only where its frame-crc, its
    /// record-crc and its body all hold, then jumps over it. A damaged record whose frame still holds is
    /// skipped by its length. Chance of a false frame: both CRC-32C values matching random bytes, about 2^-64.
    /// </summary>
    private List<ScannedRecord> RecordsPast(long damageOffset)
    {
        var found = new List<ScannedRecord>();
        var offset = damageOffset + SegmentFormat.Alignment;
        if (RecordCodec.Examine(file.Rest(damageOffset), out _, out var damagedLength, out _, out _) == RecordCodec.FrameState.Damaged && damagedLength > 0)
        {
            offset = damageOffset + damagedLength;
        }

        while (offset + SegmentFormat.FrameLength <= Length)
        {
            var rest = file.Rest(offset);
            var state = RecordCodec.Examine(rest, out var type, out var recordLength, out var checksum, out _);
            if (state == RecordCodec.FrameState.ZeroFill)
            {
                break;
            }

            if (state == RecordCodec.FrameState.Complete && type == SegmentFormat.RecordTypeVectorSet)
            {
                var body = rest[SegmentFormat.FrameLength..recordLength];
                var count = RecordCodec.CheckVectorSetBody(body, Header.Dimensions, out _);
                if (count >= 0)
                {
                    found.Add(new ScannedRecord(new RecordLocation(Header.SegmentId, offset, recordLength, checksum), PageKey.FromHash(body[..PageKey.ByteLength]), count));
                    offset += recordLength;
                    continue;
                }
            }

            offset += SegmentFormat.Alignment;
        }

        return found;
    }

    /// <summary>
    /// Why the seal of a segment the catalog calls sealed does not hold, or null when it does: the last
    /// 40 bytes must be a seal record whose own record CRC-32C (RFC 3720 §B.4) holds, that covers every byte
    /// before it, and whose file-crc is the CRC-32C of those bytes. Records are not walked: each is proven
    /// by its own checksum, so a bad seal says nothing about them.
    /// </summary>
    public string? SealProblem()
    {
        ObjectDisposedException.ThrowIf(Volatile.Read(ref disposed) != 0, this);
        var sealOffset = Length - SegmentFormat.SealRecordLength;
        if (sealOffset < Header.EncodedLength)
        {
            return "no seal record: the file is too short";
        }

        var seal = file.Span(sealOffset, SegmentFormat.SealRecordLength);
        var state = RecordCodec.Examine(seal, out var type, out var recordLength, out _, out var problem);
        if (state != RecordCodec.FrameState.Complete || type != SegmentFormat.RecordTypeSeal || recordLength != SegmentFormat.SealRecordLength)
        {
            return "no good seal record at the end of the file" + (state == RecordCodec.FrameState.Damaged ? ": " + problem : string.Empty);
        }

        var body = seal[SegmentFormat.FrameLength..];
        var declaredLength = BinaryPrimitives.ReadUInt64LittleEndian(body[8..]);
        if (declaredLength != (ulong)sealOffset)
        {
            return $"the seal covers {declaredLength} bytes, it sits at byte {sealOffset}";
        }

        var stored = BinaryPrimitives.ReadUInt32LittleEndian(body[16..]);
        var computed = ChecksumOfPrefix(sealOffset);
        return stored == computed ? null : $"whole-file checksum mismatch (stored {stored:x8}, computed {computed:x8})";
    }

    public void Dispose()
    {
        if (Interlocked.Exchange(ref disposed, 1) == 0)
        {
            file.Release();
        }
    }

    /// <summary>The checksum of bytes [0, <paramref name="end"/>), in pieces so files above 2 GiB work.</summary>
    internal uint ChecksumOfPrefix(long end)
    {
        uint crc = 0;
        for (long at = 0; at < end;)
        {
            var piece = (int)Math.Min(end - at, 1 << 30);
            crc = Crc32C.Append(crc, file.Span(at, piece));
            at += piece;
        }

        return crc;
    }

    private string? CheckSeal(ReadOnlySpan<byte> body, long sealOffset, long sealEnd, int recordCount)
    {
        if (body.Length != SegmentFormat.SealBodyLength || BinaryPrimitives.ReadUInt32LittleEndian(body[20..]) != 0)
        {
            return "malformed seal record";
        }

        if (sealEnd != Length)
        {
            return $"{Length - sealEnd} bytes after the seal";
        }

        var declaredCount = BinaryPrimitives.ReadUInt64LittleEndian(body);
        var declaredLength = BinaryPrimitives.ReadUInt64LittleEndian(body[8..]);
        if (declaredCount != (ulong)recordCount || declaredLength != (ulong)sealOffset)
        {
            return $"seal declares {declaredCount} records in {declaredLength} bytes, the file has {recordCount} in {sealOffset}";
        }

        var stored = BinaryPrimitives.ReadUInt32LittleEndian(body[16..]);
        var computed = ChecksumOfPrefix(sealOffset);
        return stored == computed ? null : $"whole-file checksum mismatch (stored {stored:x8}, computed {computed:x8})";
    }

    private bool HasSealAtEnd()
    {
        var sealOffset = Length - SegmentFormat.SealRecordLength;
        if (sealOffset < Header.EncodedLength)
        {
            return false;
        }

        var seal = file.Span(sealOffset, SegmentFormat.SealRecordLength);
        if (RecordCodec.Examine(seal, out var type, out _, out _, out _) != RecordCodec.FrameState.Complete || type != SegmentFormat.RecordTypeSeal)
        {
            return false;
        }

        return BinaryPrimitives.ReadUInt64LittleEndian(seal[(SegmentFormat.FrameLength + 8)..]) == (ulong)sealOffset;
    }
}
