using System.Buffers.Binary;
using System.Runtime.InteropServices;
using IndexKeeper.Core.Documents;

namespace IndexKeeper.Core.Storage;

/// <summary>
/// Framing and body layout of segment records (docs/segment-format.md, "records"), shared by the writer,
/// the reader and the mapped vector-set source so the three cannot disagree.
/// </summary>
internal static class RecordCodec
{
    internal enum FrameState
    {
        /// <summary>A whole record with a good checksum.</summary>
        Complete,

        /// <summary>The record runs past the end of the bytes: a torn tail.</summary>
        Incomplete,

        /// <summary>Only zero bytes remain: space the file system extended but never wrote.</summary>
        ZeroFill,

        /// <summary>A whole record whose bytes do not match its checksum, or a checked frame that breaks the format.</summary>
        Damaged,
    }

    /// <summary>Examines the record that starts at <c>rest[0]</c>; <paramref name="rest"/> runs to the end of the readable bytes.</summary>
    public static FrameState Examine(ReadOnlySpan<byte> rest, out byte type, out int recordLength, out uint checksum, out string problem)
    {
        type = 0;
        recordLength = 0;
        checksum = 0;
        problem = string.Empty;
        if (rest.Length < SegmentFormat.FrameLength)
        {
            return rest.ContainsAnyExcept((byte)0) ? FrameState.Incomplete : FrameState.ZeroFill;
        }

        if (!rest[..SegmentFormat.FrameLength].ContainsAnyExcept((byte)0))
        {
            if (!rest.ContainsAnyExcept((byte)0))
            {
                return FrameState.ZeroFill;
            }

            problem = "zero record frame followed by data";
            return FrameState.Damaged;
        }

        // The frame has its own checksum so a damaged length reads as damage, never as a torn tail.
        var frameChecksum = BinaryPrimitives.ReadUInt32LittleEndian(rest[SegmentFormat.FrameChecksumOffset..]);
        if (Crc32C.Compute(rest[4..SegmentFormat.FrameChecksumOffset]) != frameChecksum)
        {
            problem = "record frame checksum mismatch";
            return FrameState.Damaged;
        }

        checksum = BinaryPrimitives.ReadUInt32LittleEndian(rest);
        var bodyLength = BinaryPrimitives.ReadUInt32LittleEndian(rest[4..]);
        if (bodyLength > (uint)(rest.Length - SegmentFormat.FrameLength))
        {
            return FrameState.Incomplete;
        }

        recordLength = SegmentFormat.FrameLength + (int)bodyLength;
        var computed = Crc32C.Compute(rest[4..recordLength]);
        if (computed != checksum)
        {
            problem = $"record checksum mismatch (stored {checksum:x8}, computed {computed:x8})";
            return FrameState.Damaged;
        }

        type = rest[8];
        if (rest[9..SegmentFormat.FrameChecksumOffset].ContainsAnyExcept((byte)0) || bodyLength % SegmentFormat.Alignment != 0)
        {
            problem = "malformed record frame";
            return FrameState.Damaged;
        }

        if (type is not (SegmentFormat.RecordTypeVectorSet or SegmentFormat.RecordTypeSeal))
        {
            problem = $"unknown record type {type}";
            return FrameState.Damaged;
        }

        return FrameState.Complete;
    }

    /// <summary>Checks a vector-set body against the layout for <paramref name="dimensions"/>; returns the vector count or -1 with a problem.</summary>
    public static int CheckVectorSetBody(ReadOnlySpan<byte> body, int dimensions, out string problem)
    {
        problem = string.Empty;
        if (body.Length < SegmentFormat.VectorSetPrefixLength)
        {
            problem = "vector-set record too short";
            return -1;
        }

        var count = BinaryPrimitives.ReadUInt32LittleEndian(body[PageKey.ByteLength..]);
        if (count > SegmentFormat.MaxVectorsPerRecord
            || BinaryPrimitives.ReadUInt32LittleEndian(body[(PageKey.ByteLength + 4)..]) != 0
            || body.Length != SegmentFormat.VectorSetBodyLength(dimensions, (int)count))
        {
            problem = "vector-set record length does not match its vector count";
            return -1;
        }

        return (int)count;
    }

    /// <summary>Views a checked vector-set body; the spans point into <paramref name="body"/>.</summary>
    public static StoredVectors View(ReadOnlySpan<byte> body, int dimensions, int count, PageKey key)
    {
        var vectorBytes = count * dimensions * 2;
        var codeBytes = count * (dimensions / 8);
        var data = body[SegmentFormat.VectorSetPrefixLength..];
        return new StoredVectors(
            key,
            dimensions,
            MemoryMarshal.Cast<byte, Half>(data[..vectorBytes]),
            MemoryMarshal.Cast<byte, ulong>(data.Slice(vectorBytes, codeBytes)),
            MemoryMarshal.Cast<byte, PageBox>(data[(vectorBytes + codeBytes)..]));
    }

    /// <summary>
    /// Fills a frame for a body of <paramref name="bodyLength"/> bytes, all but the record checksum;
    /// returns the running record checksum over the frame after that field, to be extended over the body.
    /// </summary>
    public static uint BeginFrame(Span<byte> frame, byte type, int bodyLength)
    {
        frame[..SegmentFormat.FrameLength].Clear();
        BinaryPrimitives.WriteUInt32LittleEndian(frame[4..], (uint)bodyLength);
        frame[8] = type;
        BinaryPrimitives.WriteUInt32LittleEndian(frame[SegmentFormat.FrameChecksumOffset..], Crc32C.Compute(frame[4..SegmentFormat.FrameChecksumOffset]));
        return Crc32C.Compute(frame[4..SegmentFormat.FrameLength]);
    }

    /// <summary>Stores the finished record checksum in a frame filled by <see cref="BeginFrame"/>.</summary>
    public static void EndFrame(Span<byte> frame, uint recordChecksum) => BinaryPrimitives.WriteUInt32LittleEndian(frame, recordChecksum);

    /// <summary>Fills a whole seal record (docs/segment-format.md, "seal") of <see cref="SegmentFormat.SealRecordLength"/> bytes.</summary>
    public static void EncodeSeal(Span<byte> seal, long recordCount, long sealedLength, uint fileChecksum)
    {
        var crc = BeginFrame(seal, SegmentFormat.RecordTypeSeal, SegmentFormat.SealBodyLength);
        var body = seal[SegmentFormat.FrameLength..SegmentFormat.SealRecordLength];
        BinaryPrimitives.WriteUInt64LittleEndian(body, (ulong)recordCount);
        BinaryPrimitives.WriteUInt64LittleEndian(body[8..], (ulong)sealedLength);
        BinaryPrimitives.WriteUInt32LittleEndian(body[16..], fileChecksum);
        BinaryPrimitives.WriteUInt32LittleEndian(body[20..], 0);
        EndFrame(seal, Crc32C.Append(crc, body));
    }
}
