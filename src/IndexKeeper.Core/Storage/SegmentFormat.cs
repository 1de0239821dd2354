namespace IndexKeeper.Core.Storage;

/// <summary>
/// The constants of the segment file format, specified in docs/segment-format.md. Every value here
/// reaches disk: never change one; a different layout gets a new <see cref="Version"/>.
/// </summary>
internal static class SegmentFormat
{
    /// <summary>"IKVSEG\r\n": the CR LF pair exposes a file mangled by newline translation.</summary>
    public static ReadOnlySpan<byte> Magic => "IKVSEG\r\n"u8;

    /// <summary>The format version this code writes and the only one it reads. Never change meaning.</summary>
    public const uint Version = 1;

    // Header field offsets (docs/segment-format.md, "header"). Never change.
    public const int VersionOffset = 8;
    public const int HeaderLengthOffset = 12;
    public const int SegmentIdOffset = 16;
    public const int CreatedOffset = 24;
    public const int DimensionsOffset = 32;
    public const int VectorElementOffset = 36;
    public const int CodeElementOffset = 37;
    public const int RegionElementOffset = 38;
    public const int EncoderIdLengthOffset = 40;
    public const int EncoderIdOffset = 42;

    /// <summary>The smallest header: fixed fields, one encoder id byte, the checksum, padded to 8.</summary>
    public const int MinHeaderLength = 48;

    public const int MaxHeaderLength = 4096;

    public const int MaxEncoderIdBytes = 1024;

    /// <summary>Vector element type: IEEE 754-2008 binary16. Never change.</summary>
    public const byte VectorElementFloat16 = 1;

    /// <summary>Code element type: one sign bit per dimension, 64 to a little-endian word. Never change.</summary>
    public const byte CodeElementSignBits = 1;

    /// <summary>Region element type: four binary32 values (left, bottom, right, top). Never change.</summary>
    public const byte RegionElementBox4Float32 = 1;

    /// <summary>Record frame: record checksum u32, body length u32, type u8, 3 zero bytes, frame checksum u32.</summary>
    public const int FrameLength = 16;

    /// <summary>Where the frame checksum (over frame bytes 4..11) sits in the frame.</summary>
    public const int FrameChecksumOffset = 12;

    /// <summary>Record type of a vector set. Never change.</summary>
    public const byte RecordTypeVectorSet = 1;

    /// <summary>Record type of the seal, the last record of a sealed segment. Never change.</summary>
    public const byte RecordTypeSeal = 2;

    /// <summary>Vector-set body before the vectors: page key (32), vector count u32, zero u32.</summary>
    public const int VectorSetPrefixLength = 40;

    /// <summary>Seal body: record count u64, sealed length u64, file checksum u32, zero u32.</summary>
    public const int SealBodyLength = 24;

    public const int SealRecordLength = FrameLength + SealBodyLength;

    /// <summary>Records start and end on 8-byte boundaries so mapped spans of ulong are aligned.</summary>
    public const int Alignment = 8;

    public const int MinDimensions = 64;

    public const int MaxDimensions = 8192;

    /// <summary>Largest vector count in one record; keeps every record length inside an int.</summary>
    public const int MaxVectorsPerRecord = 65536;

    public const int RegionBytes = 16;

    /// <summary>Bytes of one vector row in a record: float16 components, sign code words, region box.</summary>
    public static int BytesPerVector(int dimensions) => (dimensions * 2) + (dimensions / 8) + RegionBytes;

    public static int VectorSetBodyLength(int dimensions, int vectorCount) =>
        VectorSetPrefixLength + (vectorCount * BytesPerVector(dimensions));

    public static bool IsValidDimensions(int dimensions) =>
        dimensions is >= MinDimensions and <= MaxDimensions && dimensions % 64 == 0;

    public static int HeaderLength(int encoderIdBytes) => AlignUp(EncoderIdOffset + encoderIdBytes + sizeof(uint));

    public static int AlignUp(int value) => (value + Alignment - 1) & ~(Alignment - 1);
}
