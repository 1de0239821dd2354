using System.Buffers;
using System.Buffers.Binary;
using System.Runtime.InteropServices;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Faults;

namespace IndexKeeper.Core.Storage;

/// <summary>
/// Appends vector-set records to one open segment (format: docs/segment-format.md) and seals it.
/// Not thread-safe: one thread writes. Ordering rules for callers:
/// <list type="bullet">
/// <item>A location returned by <c>Append</c> may be committed to the catalog only after
/// <see cref="Flush"/>(durable: true) has returned.</item>
/// <item>After any I/O failure the writer is broken: dispose it and <see cref="Reopen"/> the file, which
/// cuts the torn tail. Records appended but not flushed durably are lost, which is fine: they were not committed.</item>
/// </list>
/// </summary>
public sealed class SegmentWriter : IDisposable
{
    private readonly SegmentWriterOptions options;
    private readonly TimeProvider time;
    private readonly string? publishPath;
    private FileStream? stream;
    private uint fileChecksum;
    private bool broken;

    private SegmentWriter(string path, string? publishPath, FileStream stream, SegmentHeader header, SegmentWriterOptions options, TimeProvider time, long length, long recordCount, uint fileChecksum)
    {
        Path = path;
        this.publishPath = publishPath;
        this.stream = stream;
        Header = header;
        this.options = options;
        this.time = time;
        Length = length;
        RecordCount = recordCount;
        this.fileChecksum = fileChecksum;
    }

    /// <summary>Where the bytes go now (a temp name for a compaction output until it is sealed).</summary>
    public string Path { get; private set; }

    public SegmentHeader Header { get; }

    public long SegmentId => Header.SegmentId;

    /// <summary>Bytes written so far, header included (buffered bytes count).</summary>
    public long Length { get; private set; }

    public long RecordCount { get; private set; }

    public bool IsSealed { get; private set; }

    /// <summary>True once the segment has reached its configured size or age; the caller seals at the next batch boundary.</summary>
    public bool ShouldSeal => Length >= options.SealAtBytes || time.GetUtcNow() - Header.Created >= options.SealAtAge;

    /// <summary>Creates <c>seg-NNNNNN.vec</c> in <paramref name="directory"/>; the header and the new name are durable on return.</summary>
    public static SegmentWriter Create(string directory, SegmentHeader header, SegmentWriterOptions? options = null, TimeProvider? time = null) =>
        CreateAt(SegmentFileNames.PathOf(directory, header.SegmentId), null, header, options, time);

    /// <summary>Creates a temp-named segment that <see cref="Seal"/> renames to its real name; disposing it unsealed deletes it.</summary>
    internal static SegmentWriter CreateTemporary(string directory, SegmentHeader header, SegmentWriterOptions? options = null, TimeProvider? time = null) =>
        CreateAt(SegmentFileNames.TempPathOf(directory, header.SegmentId), SegmentFileNames.PathOf(directory, header.SegmentId), header, options, time);

    /// <summary>
    /// Continues an open segment after a restart: checks it, cuts a torn tail (durably) and appends after
    /// the last good record. A damaged or sealed segment is refused, and so is one whose good records end
    /// before <paramref name="committedLength"/> (what a catalog committed): a record there that reads as
    /// torn is damage to committed bytes, never a tail to cut and append after. REQUIRES: no reader in this
    /// process maps the file's tail past the committed length.
    /// </summary>
    /// <param name="committedLength">The length the catalog committed; null for a file no catalog knows (tools, tests).</param>
    public static SegmentWriter Reopen(string path, SegmentWriterOptions? options = null, TimeProvider? time = null, long? committedLength = null)
    {
        options ??= new SegmentWriterOptions();
        options.ThrowIfInvalid();
        SegmentScan scan;
        uint checksum;
        using (var reader = SegmentReader.Open(path))
        {
            scan = reader.Scan();
            if (scan.End == SegmentEnd.Damaged)
            {
                throw new SegmentFormatException(path, scan.DamageOffset, "cannot append to a damaged segment: " + scan.Problem);
            }

            if (scan.End == SegmentEnd.Sealed)
            {
                throw new InvalidOperationException($"{path} is sealed; sealed segments are immutable.");
            }

            if (scan.ValidLength < committedLength)
            {
                throw new SegmentFormatException(
                    path,
                    scan.ValidLength,
                    $"cannot append: the catalog committed {committedLength} bytes but the records read end at {scan.ValidLength} (the bytes there are damaged, not a torn tail); nothing was cut. Run `indexkeeper verify`, then `repair`");
            }

            checksum = reader.ChecksumOfPrefix(scan.ValidLength);
        }

        var stream = new FileStream(path, FileMode.Open, FileAccess.Write, FileShare.Read | FileShare.Delete, options.WriteBufferBytes);
        try
        {
            if (stream.Length != scan.ValidLength)
            {
                stream.SetLength(scan.ValidLength);
                stream.Flush(flushToDisk: true);
            }

            stream.Position = scan.ValidLength;
            return new SegmentWriter(path, null, stream, scan.Header, options, time ?? TimeProvider.System, scan.ValidLength, scan.Records.Count, checksum);
        }
        catch
        {
            stream.Dispose();
            throw;
        }
    }

    /// <summary>Appends a vector set given as floats: stored as float16, sign codes taken from the float16 values.</summary>
    public RecordLocation Append(PageKey key, VectorSet vectorSet)
    {
        ArgumentNullException.ThrowIfNull(vectorSet);
        var halves = ArrayPool<Half>.Shared.Rent(vectorSet.Vectors.Length);
        try
        {
            var vectors = halves.AsSpan(0, vectorSet.Vectors.Length);
            VectorQuantization.ToFloat16(vectorSet.Vectors, vectors);
            return Append(key, vectorSet.Dimensions, vectors, vectorSet.Regions);
        }
        finally
        {
            ArrayPool<Half>.Shared.Return(halves);
        }
    }

    /// <summary>Appends a vector set already in float16, rows of the segment's dimension count, one region per row.</summary>
    public RecordLocation Append(PageKey key, ReadOnlySpan<Half> vectors, ReadOnlySpan<PageBox> regions) =>
        Append(key, Header.Dimensions, vectors, regions);

    /// <summary>Copies a record verbatim (compaction); REQUIRES: it was checked by a reader of the same encoder and dimensions.</summary>
    internal RecordLocation AppendVerbatim(ReadOnlySpan<byte> record)
    {
        _ = OpenStream();
        var location = new RecordLocation(SegmentId, Length, record.Length, BinaryPrimitives.ReadUInt32LittleEndian(record));
        try
        {
            FaultInjection.Reach(FaultPoints.CompactionOutputWrite);
            Write(record);
        }
        catch
        {
            broken = true;
            throw;
        }

        RecordCount++;
        return location;
    }

    /// <summary>Flushes buffered records to the file; with <paramref name="durable"/> also to the disk (fsync).</summary>
    public void Flush(bool durable)
    {
        var output = OpenStream();
        try
        {
            if (durable)
            {
                FaultInjection.Reach(FaultPoints.SegmentAppendBeforeFsync);
            }

            output.Flush(flushToDisk: durable);
            if (durable)
            {
                FaultInjection.Reach(FaultPoints.SegmentAppendAfterFsync);
            }
        }
        catch
        {
            broken = true;
            throw;
        }
    }

    /// <summary>
    /// Writes the seal, fsyncs, closes, marks the file read-only and (for a compaction output) renames it
    /// to its real name and syncs the directory. The segment is immutable from here on.
    /// </summary>
    public SealedSegment Seal()
    {
        var output = OpenStream();
        try
        {
            FaultInjection.Reach(FaultPoints.SegmentSealBefore);
            var sealedChecksum = fileChecksum;
            Span<byte> seal = stackalloc byte[SegmentFormat.SealRecordLength];
            RecordCodec.EncodeSeal(seal, RecordCount, Length, sealedChecksum);
            Write(seal);
            output.Flush(flushToDisk: true);
            FaultInjection.Reach(FaultPoints.SegmentSealAfterFsync);
            output.Dispose();
            stream = null;
            IsSealed = true;
            MakeReadOnly(Path);
            if (publishPath is not null)
            {
                FaultInjection.Reach(FaultPoints.SegmentRenameBefore);
                File.Move(Path, publishPath, overwrite: false);
                Path = publishPath;
                FaultInjection.Reach(FaultPoints.SegmentRenameAfter);
            }

            DirectorySync.Flush(System.IO.Path.GetDirectoryName(System.IO.Path.GetFullPath(Path))!);
            FaultInjection.Reach(FaultPoints.SegmentSealAfter);
            return new SealedSegment(SegmentId, Path, Length, RecordCount, sealedChecksum);
        }
        catch
        {
            broken = true;
            throw;
        }
    }

    /// <summary>Closes without sealing: an open segment stays on disk as it is; an unsealed temp file is deleted.</summary>
    public void Dispose()
    {
        if (stream is null)
        {
            return;
        }

        try
        {
            if (!broken)
            {
                stream.Flush();
            }
        }
        finally
        {
            try
            {
                stream.Dispose();
            }
            catch (IOException) when (broken)
            {
                // Closing writes out what the failed write left in the buffer and fails again (a full
                // disk); the handle is closed anyway, and those bytes were never committed: the caller
                // cuts the file back to its committed length, which it could not if this threw.
            }

            stream = null;
            if (publishPath is not null && !IsSealed)
            {
                File.Delete(Path);
            }
        }
    }

    private static SegmentWriter CreateAt(string path, string? publishPath, SegmentHeader header, SegmentWriterOptions? options, TimeProvider? time)
    {
        ArgumentNullException.ThrowIfNull(header);
        options ??= new SegmentWriterOptions();
        options.ThrowIfInvalid();
        var bytes = header.Encode();

        // CreateNew: a segment file is never overwritten; an existing name means the id was reused.
        var stream = new FileStream(path, FileMode.CreateNew, FileAccess.Write, FileShare.Read | FileShare.Delete, options.WriteBufferBytes);
        try
        {
            stream.Write(bytes);
            stream.Flush(flushToDisk: true);
            DirectorySync.Flush(System.IO.Path.GetDirectoryName(System.IO.Path.GetFullPath(path))!);
            return new SegmentWriter(path, publishPath, stream, header, options, time ?? TimeProvider.System, bytes.Length, 0, Crc32C.Compute(bytes));
        }
        catch
        {
            stream.Dispose();
            File.Delete(path);
            throw;
        }
    }

    internal static void MakeReadOnly(string path)
    {
        if (OperatingSystem.IsWindows())
        {
            File.SetAttributes(path, File.GetAttributes(path) | FileAttributes.ReadOnly);
        }
        else
        {
            File.SetUnixFileMode(path, File.GetUnixFileMode(path) & ~(UnixFileMode.UserWrite | UnixFileMode.GroupWrite | UnixFileMode.OtherWrite));
        }
    }

    private RecordLocation Append(PageKey key, int dimensions, ReadOnlySpan<Half> vectors, ReadOnlySpan<PageBox> regions)
    {
        if (dimensions != Header.Dimensions)
        {
            throw new ArgumentException($"vectors of {dimensions} dimensions do not belong in a segment of {Header.Dimensions}.", nameof(dimensions));
        }

        if (vectors.Length % dimensions != 0 || vectors.Length / dimensions != regions.Length)
        {
            throw new ArgumentException($"{vectors.Length} components and {regions.Length} regions do not form rows of {dimensions}.", nameof(vectors));
        }

        if (regions.Length > SegmentFormat.MaxVectorsPerRecord)
        {
            throw new ArgumentException($"a record holds at most {SegmentFormat.MaxVectorsPerRecord} vectors, got {regions.Length}.", nameof(vectors));
        }

        var codeWords = regions.Length * (dimensions / 64);
        var codes = ArrayPool<ulong>.Shared.Rent(Math.Max(codeWords, 1));
        try
        {
            VectorQuantization.SignCodes(vectors, dimensions, codes);
            var codeBytes = MemoryMarshal.AsBytes(codes.AsSpan(0, codeWords));
            var bodyLength = SegmentFormat.VectorSetBodyLength(dimensions, regions.Length);
            Span<byte> prefix = stackalloc byte[SegmentFormat.VectorSetPrefixLength];
            prefix.Clear();
            key.ToBytes().CopyTo(prefix);
            BinaryPrimitives.WriteUInt32LittleEndian(prefix[PageKey.ByteLength..], (uint)regions.Length);
            Span<byte> frame = stackalloc byte[SegmentFormat.FrameLength];
            var crc = RecordCodec.BeginFrame(frame, SegmentFormat.RecordTypeVectorSet, bodyLength);
            crc = Crc32C.Append(crc, prefix);
            crc = Crc32C.Append(crc, MemoryMarshal.AsBytes(vectors));
            crc = Crc32C.Append(crc, codeBytes);
            crc = Crc32C.Append(crc, MemoryMarshal.AsBytes(regions));
            RecordCodec.EndFrame(frame, crc);

            _ = OpenStream();
            var location = new RecordLocation(SegmentId, Length, SegmentFormat.FrameLength + bodyLength, crc);
            try
            {
                Write(frame);
                Write(prefix);
                Write(MemoryMarshal.AsBytes(vectors));
                Write(codeBytes);
                Write(MemoryMarshal.AsBytes(regions));
            }
            catch
            {
                broken = true;
                throw;
            }

            RecordCount++;
            return location;
        }
        finally
        {
            ArrayPool<ulong>.Shared.Return(codes);
        }
    }

    private void Write(ReadOnlySpan<byte> bytes)
    {
        stream!.Write(bytes);
        fileChecksum = Crc32C.Append(fileChecksum, bytes);
        Length += bytes.Length;
    }

    private FileStream OpenStream()
    {
        if (IsSealed)
        {
            throw new InvalidOperationException($"segment {SegmentId} is sealed; sealed segments are immutable.");
        }

        if (broken)
        {
            throw new InvalidOperationException($"segment {SegmentId}: an earlier write failed; dispose this writer and reopen the file.");
        }

        return stream ?? throw new ObjectDisposedException(nameof(SegmentWriter));
    }
}
