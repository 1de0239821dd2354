using System.Buffers.Binary;
using System.Runtime.InteropServices;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Core.Search;

/// <summary>
/// The serving view on disk (docs/serving-view.md, version <see cref="Version"/>): in the index's
/// <c>serving/</c> folder, per encoder a view file (header, page directory, every page's sign codes and the
/// centroid lists when the view has them, CRC-32C trailer) naming a graph file when it has a graph (the candidate graph as the USearch package
/// saves it, its length and CRC-32C in the view file). A writer publishes a new graph file, then the view file
/// by rename; a reader checks version, generation, candidate source, encoding parameters and both checksums,
/// and treats any mismatch as "stale", never as data.
/// </summary>
internal static class ServingViewFile
{
    /// <summary>
    /// The format this build reads and writes (2: candidate source and centroid lists; 3: the lists' vectors page by
    /// page with their centroids, read in bulk; 4: when the centroids were trained and the vectors added since; 5: the
    /// page codes in a section of their own, kept for <c>All</c> too, before the centroid lists). Never reuse a number.
    /// </summary>
    public const int Version = 5;

    public const string Folder = "serving";

    private const int EntryLength = PageKey.ByteLength + 8 + 8 + 8 + 4 + 4 + 4;
    private static readonly byte[] Magic = "IKSV"u8.ToArray();

    /// <summary>The view file of an encoder: the first 16 hex digits of its id name it.</summary>
    public static string PathOf(string indexDirectory, string encoderId) => Path.Combine(indexDirectory, Folder, Stem(encoderId) + ".view");

    /// <summary>
    /// Reads the view of <paramref name="encoderId"/> if it shows <paramref name="generation"/> and holds the
    /// structure of <paramref name="source"/> (a file of centroid lists serves <c>All</c> too); null with the reason otherwise. <paramref name="mapOnly"/> maps the graph read-only (search), else loads it (to apply
    /// changes). Nothing is written.
    /// </summary>
    public static ServingView? TryRead(string indexDirectory, string encoderId, long catalogStamp, long generation, CandidateSource source, bool mapOnly, out string reason)
    {
        var path = PathOf(indexDirectory, encoderId);
        FileStream file;
        try
        {
            file = Open(path);
        }
        catch (Exception ex) when (ex is FileNotFoundException or DirectoryNotFoundException)
        {
            reason = "no serving view on disk";
            return null;
        }

        try
        {
            using (file)
            {
                return Parse(new Cursor(file, file.Length), indexDirectory, encoderId, catalogStamp, generation, source, mapOnly, out reason);
            }
        }
        catch (Exception ex) when (ex is ArgumentException or IndexOutOfRangeException or FormatException or IOException or EndOfStreamException)
        {
            reason = $"serving view {path} cannot be read ({ex.Message})";
            return null;
        }
    }

    /// <summary>
    /// Publishes <paramref name="view"/>: the graph under a new name, synced; the view file written beside,
    /// synced and renamed over the old one; then older graph files of the encoder are deleted.
    /// </summary>
    public static void Write(string indexDirectory, ServingView view, long catalogStamp)
    {
        ArgumentNullException.ThrowIfNull(view);
        var folder = Path.Combine(indexDirectory, Folder);
        Directory.CreateDirectory(folder);
        var stem = Stem(view.EncoderId);
        view.Write((entries, nextId, graph, pageCodes, centroids) =>
        {
            var graphName = string.Empty;
            long graphLength = 0;
            uint graphChecksum = 0;
            if (graph is not null && entries.Count > 0)
            {
                graphName = $"{stem}-{view.Generation}-{Environment.ProcessId}.graph";
                var graphPath = Path.Combine(folder, graphName);
                graph.Save(graphPath);
                (graphLength, graphChecksum) = SyncAndChecksum(graphPath);
            }

            // Written straight to the file through a running checksum: at 100,000 pages the view is hundreds of
            // megabytes, which a buffer of the whole would hold twice over while it grows.
            var path = PathOf(indexDirectory, view.EncoderId);
            var temporary = path + ".tmp";
            using (var file = new FileStream(temporary, FileMode.Create, FileAccess.Write, FileShare.None, 1 << 20))
            using (var body = new ChecksummedStream(file))
            using (var writer = new BinaryWriter(body, System.Text.Encoding.UTF8, leaveOpen: true))
            {
                writer.Write(Magic);
                writer.Write(Version);
                writer.Write(catalogStamp);
                writer.Write(view.Generation);
                WriteString(writer, view.EncoderId);
                writer.Write((int)view.Source);
                writer.Write(view.Dimensions);
                writer.Write(FixedDimensionalEncoding.Seed);
                writer.Write(FixedDimensionalEncoding.Repetitions);
                writer.Write(FixedDimensionalEncoding.BucketBits);
                writer.Write(FixedDimensionalEncoding.ProjectionDimensions);
                writer.Write(nextId);
                writer.Write(view.Recall?.Recall ?? double.NaN);
                writer.Write(view.Recall?.Queries ?? 0);
                writer.Write(view.Recall?.Generation ?? 0);
                writer.Write(view.Recall?.MeasuredAt.UtcTicks ?? 0);
                writer.Write(view.ChangedSinceRecall);
                var training = view.Training;
                writer.Write(training.TrainedAt?.UtcTicks ?? 0);
                writer.Write(training.FirstIdAfterTraining);
                writer.Write(training.Vectors);
                writer.Write(training.VectorsAddedSinceTraining);
                writer.Write(entries.Count);
                WriteString(writer, graphName);
                writer.Write(graphLength);
                writer.Write(graphChecksum);
                foreach (var (id, entry) in entries)
                {
                    writer.Write(entry.Key.ToBytes());
                    writer.Write(id);
                    writer.Write(entry.Location.SegmentId);
                    writer.Write(entry.Location.Offset);
                    writer.Write(entry.Location.Length);
                    writer.Write(entry.Location.Checksum);
                    writer.Write(entry.VectorCount);
                }

                // The page codes: the live pages in slot order, their row counts and their rows' sign codes; then the
                // centroid lists: the centroids and each of those rows' centroid (the lists are made again from them when read).
                RequireLittleEndian();
                var live = pageCodes is null || entries.Count == 0 ? [] : Enumerable.Range(0, pageCodes.Slots).Where(pageCodes.IsLive).ToArray();
                writer.Write(live.Length);
                if (live.Length > 0)
                {
                    writer.Write(MemoryMarshal.AsBytes<ulong>([.. live.Select(pageCodes!.IdOf)]));
                    var rows = live.Select(pageCodes.RowsOf).ToArray();
                    writer.Write(MemoryMarshal.AsBytes<int>(rows));
                    writer.Write(checked((int)rows.Sum(r => (long)r)));
                    foreach (var slot in live)
                    {
                        writer.Write(MemoryMarshal.AsBytes(pageCodes.CodesOf(slot)));
                    }
                }

                writer.Write(live.Length > 0 ? centroids?.CentroidCount ?? 0 : 0);
                if (centroids is not null && live.Length > 0)
                {
                    writer.Write(MemoryMarshal.AsBytes(centroids.Centroids));
                    foreach (var slot in live)
                    {
                        writer.Write(MemoryMarshal.AsBytes(centroids.CentroidsOf(slot)));
                    }
                }

                writer.Flush();
                file.Write(BitConverter.GetBytes(body.Checksum));
                file.Flush(flushToDisk: true);
            }

            File.Move(temporary, path, overwrite: true);
            DirectorySync.Flush(folder);
            foreach (var old in Directory.EnumerateFiles(folder, stem + "-*.graph"))
            {
                if (Path.GetFileName(old) != graphName)
                {
                    TryDelete(old);
                }
            }
        });
    }

    /// <summary>
    /// The recall figure and the training figures of the view file of <paramref name="encoderId"/> whatever catalog
    /// state it shows; null when there is no readable file (version and checksum checked) or its candidates are not
    /// of <paramref name="source"/>. Nothing is written.
    /// </summary>
    public static (CandidateRecall? Recall, DateTimeOffset? TrainedAt, double? AddedShare)? ReadFigures(string indexDirectory, string encoderId, CandidateSource source)
    {
        try
        {
            using var file = Open(PathOf(indexDirectory, encoderId));
            var reader = new Cursor(file, file.Length);
            if (file.Length < Magic.Length + 8 || !reader.Bytes(Magic.Length).SequenceEqual(Magic) || reader.Int32() != Version)
            {
                return null;
            }

            reader.Int64();
            reader.Int64();
            if (reader.String() != encoderId || (CandidateSource)reader.Int32() != source)
            {
                return null;
            }

            reader.Bytes(4 + 8 + 4 + 4 + 4 + 8);
            var recall = ReadRecall(reader);
            reader.Int64();
            var training = ReadTraining(reader);

            // The figures count only from a file that is whole: the rest is read through the checksum in blocks.
            return reader.ChecksumMatches() ? (recall, training.TrainedAt, training.AddedShare) : null;
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException or EndOfStreamException or ArgumentException or FormatException)
        {
            return null;
        }
    }

    // Fields are checked as they are read; no view is returned before the trailer's checksum matched every byte.
    private static ServingView? Parse(Cursor reader, string indexDirectory, string encoderId, long catalogStamp, long generation, CandidateSource source, bool mapOnly, out string reason)
    {
        if (reader.Remaining < Magic.Length + 4 || !reader.Bytes(Magic.Length).SequenceEqual(Magic))
        {
            reason = "the serving view file is not one (magic)";
            return null;
        }

        var version = reader.Int32();
        if (version != Version)
        {
            reason = $"the serving view file has version {version}, this build reads {Version}";
            return null;
        }

        if (!BitConverter.IsLittleEndian)
        {
            reason = "the serving view file is little-endian and is read in bulk on little-endian machines only";
            return null;
        }

        var fileStamp = reader.Int64();
        var fileGeneration = reader.Int64();
        var fileEncoder = reader.String();
        var fileSource = (CandidateSource)reader.Int32();
        var dimensions = reader.Int32();
        var parameters = (reader.UInt64(), reader.Int32(), reader.Int32(), reader.Int32());
        var nextId = reader.UInt64();
        var recall = ReadRecall(reader);
        var changedSinceRecall = reader.Int64();
        var training = ReadTraining(reader);
        var count = reader.Int32();
        var graphName = reader.String();
        var graphLength = reader.Int64();
        var graphChecksum = reader.UInt32();
        if (fileEncoder != encoderId)
        {
            reason = $"the serving view file is of encoder {fileEncoder}";
            return null;
        }

        // A file of centroid lists holds every page's codes, which is all that candidates of every page need.
        if (fileSource != source && !(source == CandidateSource.All && fileSource == CandidateSource.Centroids))
        {
            reason = $"the serving view holds candidates of {fileSource}, the search asks for {source}";
            return null;
        }

        if (fileStamp != catalogStamp)
        {
            reason = "the serving view was made for another catalog (it was rebuilt or replaced)";
            return null;
        }

        if (fileGeneration != generation)
        {
            reason = $"the serving view shows catalog generation {fileGeneration}, the catalog is at {generation}";
            return null;
        }

        if (parameters != (FixedDimensionalEncoding.Seed, FixedDimensionalEncoding.Repetitions, FixedDimensionalEncoding.BucketBits, FixedDimensionalEncoding.ProjectionDimensions))
        {
            reason = "the serving view was encoded with other parameters";
            return null;
        }

        if (count < 0 || (long)count * EntryLength > reader.Remaining)
        {
            reason = "the serving view file's directory has the wrong length";
            return null;
        }

        var entries = new List<(ulong Id, ServingEntry Entry)>(count);
        long vectorsInDirectory = 0;
        for (var i = 0; i < count; i++)
        {
            var key = PageKey.FromHash(reader.Bytes(PageKey.ByteLength));
            var id = reader.UInt64();
            var location = new RecordLocation(reader.Int64(), reader.Int64(), reader.Int32(), reader.UInt32());
            entries.Add((id, new ServingEntry(key, location, reader.Int32())));
            vectorsInDirectory += entries[^1].Entry.VectorCount;
        }

        if (training.Figures.Vectors != vectorsInDirectory || training.Figures.VectorsAddedSinceTraining < 0 || training.Figures.VectorsAddedSinceTraining > vectorsInDirectory)
        {
            reason = $"the serving view file counts {training.Figures.Vectors} vectors ({training.Figures.VectorsAddedSinceTraining} added since training), its directory {vectorsInDirectory}";
            return null;
        }

        var pages = reader.Int32();
        PageCodes? pageCodes = null;
        if (pages != 0)
        {
            if (pages != count || dimensions <= 0 || dimensions % 64 != 0 || (long)pages * 12 > reader.Remaining)
            {
                reason = $"the serving view file's page codes name {pages} pages of {dimensions} dimensions, its directory {count}";
                return null;
            }

            var ids = reader.Array<ulong>(pages);
            var rows = reader.Array<int>(pages);
            var vectors = reader.Int32();
            var words = dimensions / 64;
            if (vectors < 0 || (long)vectors * 8 * words > reader.Remaining)
            {
                reason = $"the serving view file's page codes name {vectors} vectors, more than it holds";
                return null;
            }

            var known = entries.Select(e => e.Id).ToHashSet();
            foreach (var id in ids)
            {
                if (!known.Contains(id))
                {
                    reason = $"the serving view file's page codes name page {id}, which its directory lacks";
                    return null;
                }
            }

            pageCodes = PageCodes.Restore(dimensions, ids, rows, reader.Array<ulong>((long)vectors * words, PageCodes.WithRoom(vectors) * words), vectors);
        }

        var centroidCount = reader.Int32();
        CentroidLists? centroids = null;
        if (centroidCount != 0)
        {
            if (pageCodes is null || centroidCount < 0 || centroidCount > CentroidLists.MaximumCentroids)
            {
                reason = $"the serving view file names {centroidCount} centroids over {pages} pages' codes";
                return null;
            }

            var values = reader.Array<float>(centroidCount * dimensions);
            centroids = CentroidLists.Restore(values, pageCodes, reader.Array<ushort>(pageCodes.Rows));
        }

        if (reader.Remaining != 0)
        {
            reason = "the serving view file has bytes after its sections";
            return null;
        }

        if (!reader.ChecksumMatches())
        {
            reason = "the serving view file's checksum does not match";
            return null;
        }

        if (count > 0 && ((fileSource == CandidateSource.Centroids) != (centroids is not null) || (fileSource != CandidateSource.Graph) != (pageCodes is not null)))
        {
            reason = "the serving view file's page codes or centroid lists do not match its candidate source";
            return null;
        }

        if (source != CandidateSource.Centroids)
        {
            centroids = null;
        }

        if (source != CandidateSource.All)
        {
            // The centroid lists hold the page codes they were read with; the graph needs none.
            pageCodes = null;
        }

        if (fileSource != source)
        {
            // The figure measured the file's own candidates, not these.
            recall = null;
            changedSinceRecall = 0;
        }

        CandidateGraph? graph = null;
        if (count > 0 && source == CandidateSource.Graph)
        {
            var graphPath = Path.Combine(indexDirectory, Folder, graphName);
            if (graphName.Length == 0 || graphName.Contains(Path.DirectorySeparatorChar, StringComparison.Ordinal) || !File.Exists(graphPath))
            {
                reason = $"the serving view's graph file '{graphName}' is missing";
                return null;
            }

            var (length, checksum) = Checksum(graphPath);
            if (length != graphLength || checksum != graphChecksum)
            {
                reason = $"the serving view's graph file '{graphName}' does not match its checksum";
                return null;
            }

            graph = CandidateGraph.Open(graphPath, mapOnly);
            if (graph.Count != count)
            {
                graph.Dispose();
                reason = $"the serving view's graph holds {graph.Count} pages, its directory {count}";
                return null;
            }
        }

        reason = string.Empty;
        return ServingView.Restore(encoderId, generation, source, dimensions, nextId, entries, graph, pageCodes, centroids, recall, changedSinceRecall, training.Figures);
    }

    /// <summary>The recall fields of the header: share (NaN when never measured), queries, generation, UTC ticks.</summary>
    private static CandidateRecall? ReadRecall(Cursor reader)
    {
        var share = reader.Double();
        var queries = reader.Int32();
        var generation = reader.Int64();
        var ticks = reader.Int64();
        return double.IsNaN(share) || ticks < DateTimeOffset.MinValue.UtcTicks || ticks > DateTimeOffset.MaxValue.UtcTicks
            ? null
            : new CandidateRecall(share, queries, generation, new DateTimeOffset(ticks, TimeSpan.Zero));
    }

    /// <summary>
    /// The training fields of the header: UTC ticks the centroids were trained (0 when not known), the first page id
    /// given after it, the live vectors and those added since; the added share is null when the time is not known.
    /// </summary>
    private static (TrainingFigures Figures, DateTimeOffset? TrainedAt, double? AddedShare) ReadTraining(Cursor reader)
    {
        var ticks = reader.Int64();
        var figures = new TrainingFigures(
            ticks <= 0 || ticks > DateTimeOffset.MaxValue.UtcTicks ? null : new DateTimeOffset(ticks, TimeSpan.Zero),
            reader.UInt64(),
            reader.Int64(),
            reader.Int64());
        return (figures, figures.TrainedAt, figures.AddedShare);
    }

    private static void RequireLittleEndian()
    {
        if (!BitConverter.IsLittleEndian)
        {
            throw new PlatformNotSupportedException("The serving view file is little-endian and written in bulk on little-endian machines only.");
        }
    }

    private static string Stem(string encoderId) => encoderId.Length > 16 ? encoderId[..16] : encoderId;

    private static (long Length, uint Checksum) SyncAndChecksum(string path)
    {
        using (var file = new FileStream(path, FileMode.Open, FileAccess.ReadWrite, FileShare.Read))
        {
            file.Flush(flushToDisk: true);
        }

        return Checksum(path);
    }

    private static (long Length, uint Checksum) Checksum(string path)
    {
        using var file = new FileStream(path, FileMode.Open, FileAccess.Read, FileShare.Read | FileShare.Delete, 1 << 20);
        var buffer = new byte[1 << 20];
        uint crc = 0;
        long length = 0;
        int read;
        while ((read = file.Read(buffer)) > 0)
        {
            crc = Crc32C.Append(crc, buffer.AsSpan(0, read));
            length += read;
        }

        return (length, crc);
    }

    private static void WriteString(BinaryWriter writer, string value)
    {
        var bytes = System.Text.Encoding.UTF8.GetBytes(value);
        writer.Write(checked((ushort)bytes.Length));
        writer.Write(bytes);
    }

    private static void TryDelete(string path)
    {
        try
        {
            File.Delete(path);
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            // A reader on Windows may still map it; the next publish deletes it.
        }
    }

    /// <summary>A write-only stream that passes bytes on and keeps the CRC-32C of all it passed.</summary>
    private sealed class ChecksummedStream(Stream inner) : Stream
    {
        public uint Checksum { get; private set; }

        public override bool CanRead => false;

        public override bool CanSeek => false;

        public override bool CanWrite => true;

        public override long Length => throw new NotSupportedException();

        public override long Position { get => throw new NotSupportedException(); set => throw new NotSupportedException(); }

        public override void Write(ReadOnlySpan<byte> buffer)
        {
            Checksum = Crc32C.Append(Checksum, buffer);
            inner.Write(buffer);
        }

        public override void Write(byte[] buffer, int offset, int count) => Write(buffer.AsSpan(offset, count));

        public override void WriteByte(byte value) => Write([value]);

        public override void Flush() => inner.Flush();

        public override int Read(byte[] buffer, int offset, int count) => throw new NotSupportedException();

        public override long Seek(long offset, SeekOrigin origin) => throw new NotSupportedException();

        public override void SetLength(long value) => throw new NotSupportedException();
    }

    private static FileStream Open(string path) => new(path, FileMode.Open, FileAccess.Read, FileShare.Read | FileShare.Delete, 1 << 20);

    /// <summary>
    /// Reads the little-endian fields of a view file in order from the file, keeping the CRC-32C of every byte read;
    /// arrays are read in bulk straight into their own memory (the file is never held whole).
    /// </summary>
    private sealed class Cursor(Stream stream, long length)
    {
        private readonly byte[] small = new byte[64];
        private long at;
        private uint checksum;

        /// <summary>Bytes left before the trailer.</summary>
        public long Remaining => length - 4 - at;

        /// <summary>The next <paramref name="count"/> bytes; valid until the next read when short.</summary>
        public ReadOnlySpan<byte> Bytes(int count)
        {
            Require(count, 1);
            var taken = count <= small.Length ? small.AsSpan(0, count) : new byte[count];
            Fill(taken);
            return taken;
        }

        public int Int32() => BinaryPrimitives.ReadInt32LittleEndian(Bytes(4));

        public uint UInt32() => BinaryPrimitives.ReadUInt32LittleEndian(Bytes(4));

        public long Int64() => BinaryPrimitives.ReadInt64LittleEndian(Bytes(8));

        public ulong UInt64() => BinaryPrimitives.ReadUInt64LittleEndian(Bytes(8));

        public double Double() => BinaryPrimitives.ReadDoubleLittleEndian(Bytes(8));

        public string String() => System.Text.Encoding.UTF8.GetString(Bytes(BinaryPrimitives.ReadUInt16LittleEndian(Bytes(2))));

        /// <summary>REQUIRES: a little-endian machine (the file's byte order is taken as it is).</summary>
        public T[] Array<T>(long count)
            where T : unmanaged => Array<T>(count, count);

        /// <summary>The next <paramref name="count"/> items in an array of <paramref name="capacity"/>, the rest not zeroed.</summary>
        public T[] Array<T>(long count, long capacity)
            where T : unmanaged
        {
            var size = System.Runtime.CompilerServices.Unsafe.SizeOf<T>();
            Require(count, size);
            var array = capacity == count ? new T[count] : GC.AllocateUninitializedArray<T>(checked((int)Math.Max(count, capacity)));
            Fill(MemoryMarshal.AsBytes(array.AsSpan(0, (int)count)));
            return array;
        }

        /// <summary>Reads what is left before the trailer through the checksum, then whether the trailer matches it.</summary>
        public bool ChecksumMatches()
        {
            var block = new byte[(int)Math.Min(1 << 20, Math.Max(0, Remaining))];
            while (Remaining > 0)
            {
                Fill(block.AsSpan(0, (int)Math.Min(block.Length, Remaining)));
            }

            Span<byte> trailer = stackalloc byte[4];
            stream.ReadExactly(trailer);
            return BinaryPrimitives.ReadUInt32LittleEndian(trailer) == checksum;
        }

        private void Require(long count, int size)
        {
            if (count < 0 || count > Remaining / size)
            {
                throw new EndOfStreamException($"{count} values of {size} bytes wanted at offset {at}, {Remaining} bytes left.");
            }
        }

        private void Fill(Span<byte> into)
        {
            stream.ReadExactly(into);
            checksum = Crc32C.Append(checksum, into);
            at += into.Length;
        }
    }
}
