using System.Buffers.Binary;
using System.Text;

namespace IndexKeeper.Core.Storage;

/// <summary>
/// What a segment declares about itself (docs/segment-format.md, "header"): one encoder and one
/// dimension count for every vector set in it.
/// </summary>
/// <param name="Created">When the segment was opened; the age limit for sealing counts from here.</param>
public sealed record SegmentHeader(long SegmentId, string EncoderId, int Dimensions, DateTimeOffset Created)
{
    internal int EncodedLength => SegmentFormat.HeaderLength(System.Text.Encoding.UTF8.GetByteCount(EncoderId));

    internal byte[] Encode()
    {
        if (SegmentId < 0)
        {
            throw new ArgumentOutOfRangeException(nameof(SegmentId), SegmentId, "A segment id is not negative.");
        }

        if (!SegmentFormat.IsValidDimensions(Dimensions))
        {
            throw new ArgumentOutOfRangeException(nameof(Dimensions), Dimensions,
                $"Dimensions must be a multiple of 64 from {SegmentFormat.MinDimensions} to {SegmentFormat.MaxDimensions} (sign codes are whole 64-bit words).");
        }

        var id = System.Text.Encoding.UTF8.GetBytes(EncoderId);
        if (id.Length is 0 or > SegmentFormat.MaxEncoderIdBytes)
        {
            throw new ArgumentException($"An encoder id is 1 to {SegmentFormat.MaxEncoderIdBytes} bytes of UTF-8.", nameof(EncoderId));
        }

        var header = new byte[SegmentFormat.HeaderLength(id.Length)];
        SegmentFormat.Magic.CopyTo(header);
        BinaryPrimitives.WriteUInt32LittleEndian(header.AsSpan(SegmentFormat.VersionOffset), SegmentFormat.Version);
        BinaryPrimitives.WriteUInt32LittleEndian(header.AsSpan(SegmentFormat.HeaderLengthOffset), (uint)header.Length);
        BinaryPrimitives.WriteInt64LittleEndian(header.AsSpan(SegmentFormat.SegmentIdOffset), SegmentId);
        BinaryPrimitives.WriteInt64LittleEndian(header.AsSpan(SegmentFormat.CreatedOffset), Created.ToUnixTimeMilliseconds());
        BinaryPrimitives.WriteUInt32LittleEndian(header.AsSpan(SegmentFormat.DimensionsOffset), (uint)Dimensions);
        header[SegmentFormat.VectorElementOffset] = SegmentFormat.VectorElementFloat16;
        header[SegmentFormat.CodeElementOffset] = SegmentFormat.CodeElementSignBits;
        header[SegmentFormat.RegionElementOffset] = SegmentFormat.RegionElementBox4Float32;
        BinaryPrimitives.WriteUInt16LittleEndian(header.AsSpan(SegmentFormat.EncoderIdLengthOffset), (ushort)id.Length);
        id.CopyTo(header.AsSpan(SegmentFormat.EncoderIdOffset));
        var checksumAt = header.Length - sizeof(uint);
        BinaryPrimitives.WriteUInt32LittleEndian(header.AsSpan(checksumAt), Crc32C.Compute(header.AsSpan(0, checksumAt)));
        return header;
    }

    /// <summary>Parses and checks a header at the start of <paramref name="file"/>, in the order magic, version, length, checksum, fields.</summary>
    internal static SegmentHeader Decode(ReadOnlySpan<byte> file, string path)
    {
        if (file.Length < SegmentFormat.MinHeaderLength)
        {
            throw new SegmentFormatException(path, null, $"truncated header: the file has {file.Length} bytes, a header needs at least {SegmentFormat.MinHeaderLength}");
        }

        if (!file[..SegmentFormat.Magic.Length].SequenceEqual(SegmentFormat.Magic))
        {
            throw new SegmentFormatException(path, null, "not a segment file (wrong magic bytes)");
        }

        var version = BinaryPrimitives.ReadUInt32LittleEndian(file[SegmentFormat.VersionOffset..]);
        if (version != SegmentFormat.Version)
        {
            throw new SegmentFormatException(path, null, $"unknown segment format version {version}; this build reads version {SegmentFormat.Version} only");
        }

        var length = BinaryPrimitives.ReadUInt32LittleEndian(file[SegmentFormat.HeaderLengthOffset..]);
        if (length is < SegmentFormat.MinHeaderLength or > SegmentFormat.MaxHeaderLength || length % SegmentFormat.Alignment != 0)
        {
            throw new SegmentFormatException(path, null, $"bad header length {length}");
        }

        if (length > file.Length)
        {
            throw new SegmentFormatException(path, null, $"truncated header: {length} bytes declared, {file.Length} in the file");
        }

        var checksumAt = (int)length - sizeof(uint);
        var stored = BinaryPrimitives.ReadUInt32LittleEndian(file[checksumAt..]);
        var actual = Crc32C.Compute(file[..checksumAt]);
        if (stored != actual)
        {
            throw new SegmentFormatException(path, null, $"header checksum mismatch (stored {stored:x8}, computed {actual:x8})");
        }

        if (file[SegmentFormat.VectorElementOffset] != SegmentFormat.VectorElementFloat16
            || file[SegmentFormat.CodeElementOffset] != SegmentFormat.CodeElementSignBits
            || file[SegmentFormat.RegionElementOffset] != SegmentFormat.RegionElementBox4Float32)
        {
            throw new SegmentFormatException(path, null,
                $"unknown element types (vectors {file[SegmentFormat.VectorElementOffset]}, codes {file[SegmentFormat.CodeElementOffset]}, regions {file[SegmentFormat.RegionElementOffset]})");
        }

        var dimensions = BinaryPrimitives.ReadUInt32LittleEndian(file[SegmentFormat.DimensionsOffset..]);
        var idLength = BinaryPrimitives.ReadUInt16LittleEndian(file[SegmentFormat.EncoderIdLengthOffset..]);
        var segmentId = BinaryPrimitives.ReadInt64LittleEndian(file[SegmentFormat.SegmentIdOffset..]);
        if (dimensions > SegmentFormat.MaxDimensions || !SegmentFormat.IsValidDimensions((int)dimensions)
            || idLength is 0 or > SegmentFormat.MaxEncoderIdBytes || SegmentFormat.HeaderLength(idLength) != length || segmentId < 0)
        {
            throw new SegmentFormatException(path, null, "malformed header fields");
        }

        string encoderId;
        try
        {
            encoderId = new UTF8Encoding(false, throwOnInvalidBytes: true).GetString(file.Slice(SegmentFormat.EncoderIdOffset, idLength));
        }
        catch (DecoderFallbackException)
        {
            throw new SegmentFormatException(path, null, "encoder id is not UTF-8");
        }

        var created = DateTimeOffset.FromUnixTimeMilliseconds(BinaryPrimitives.ReadInt64LittleEndian(file[SegmentFormat.CreatedOffset..]));
        return new SegmentHeader(segmentId, encoderId, (int)dimensions, created);
    }
}
