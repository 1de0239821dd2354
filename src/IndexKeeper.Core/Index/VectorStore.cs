using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Compaction;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Faults;
using IndexKeeper.Core.Storage;
using IndexKeeper.Core.Telemetry;

namespace IndexKeeper.Core.Index;

/// <summary>
/// The segments of one index joined to its catalog: appends vector sets and commits them, opens live
/// vector sets for search, compacts, and repairs what a crash left at open.
/// </summary>
/// <remarks>
/// Ordering of every change (as LevelDB publishes a version): write and fsync segment bytes, then commit
/// the catalog transaction that references them, then delete what is no longer referenced.
/// REQUIRES: the index lock is held; one thread writes (readers of <see cref="OpenLive"/> may be many).
/// A reader reads the catalog and takes its maps under <c>swapGate</c>, and compaction commits a swap and
/// retires the old segments under it, so a reader never names a segment retired in between.
/// The open writers are touched only under <c>writerGate</c>: a reader flushes them (so it sees what was
/// committed) while the daemon's writer thread may be appending or sealing.
/// </remarks>
public sealed class VectorStore : IDisposable
{
    public const string SegmentsFolder = ExistingIndex.SegmentsFolder;

    private readonly IndexCatalog catalog;
    private readonly SegmentWriterOptions writerOptions;
    private readonly SegmentFileSet files;
    private readonly Dictionary<string, SegmentWriter> writers = new(StringComparer.Ordinal);
    private readonly object swapGate = new();
    private readonly object writerGate = new();

    private VectorStore(IndexCatalog catalog, string directory, SegmentWriterOptions writerOptions, Func<IDisposable?>? deleteGate)
    {
        this.catalog = catalog;
        Directory = directory;
        this.writerOptions = writerOptions;
        files = new SegmentFileSet(directory, deleteGate);
    }

    public string Directory { get; }

    /// <summary>What <see cref="Open"/> repaired; empty after a clean shutdown.</summary>
    public IReadOnlyList<string> Repairs { get; private set; } = [];

    public static VectorStore Open(IndexCatalog catalog, string indexDirectory, SegmentWriterOptions? writerOptions = null)
    {
        ArgumentNullException.ThrowIfNull(catalog);
        var directory = Path.Combine(indexDirectory, SegmentsFolder);
        System.IO.Directory.CreateDirectory(directory);

        // Readers in other processes may still map a segment compaction retired; it is deleted only while none is open.
        var store = new VectorStore(catalog, directory, writerOptions ?? new SegmentWriterOptions(), () => ReaderGate.TryEnterExclusive(indexDirectory));
        store.Repairs = StoreRecovery.Run(catalog, directory);
        return store;
    }

    /// <summary>
    /// Opens the segments for reading only (search, status): no folder is created, nothing is repaired, and
    /// every method that would write refuses. What a crash left is repaired by the next writing open.
    /// </summary>
    public static VectorStore OpenForReading(IndexCatalog catalog, string indexDirectory)
    {
        ArgumentNullException.ThrowIfNull(catalog);
        return new VectorStore(catalog, Path.Combine(indexDirectory, SegmentsFolder), new SegmentWriterOptions(), deleteGate: null) { ReadOnly = true };
    }

    /// <summary>Opened by <see cref="OpenForReading"/>: appends, seals and compaction refuse.</summary>
    public bool ReadOnly { get; private init; }

    /// <summary>
    /// Appends a batch of vector sets of one encoder, makes the bytes durable, then commits them to the
    /// catalog with the queue entries they satisfy. On an I/O failure (disk full) nothing of the batch is
    /// committed and the open segment is cut back to its committed length at the next append.
    /// </summary>
    public void AppendAndCommit(EncoderIdentity encoder, IReadOnlyList<(PageKey Key, VectorSet Vectors)> batch) =>
        AppendAndCommit(encoder, batch, static (writer, key, vectors) => writer.Append(key, vectors), static vectors => vectors.Count);

    /// <summary>
    /// <see cref="AppendAndCommit(EncoderIdentity, IReadOnlyList{ValueTuple{PageKey, VectorSet}})"/> for vector sets
    /// already in float16 (a remote worker's): the same records, durability and catalog commit, without the conversion.
    /// </summary>
    public void AppendAndCommit(EncoderIdentity encoder, IReadOnlyList<(PageKey Key, Float16VectorSet Vectors)> batch) =>
        AppendAndCommit(encoder, batch, static (writer, key, vectors) => writer.Append(key, vectors.Vectors, vectors.Regions), static vectors => vectors.Count);

    private void AppendAndCommit<TVectors>(
        EncoderIdentity encoder,
        IReadOnlyList<(PageKey Key, TVectors Vectors)> batch,
        Func<SegmentWriter, PageKey, TVectors, RecordLocation> append,
        Func<TVectors, int> countOf)
    {
        RefuseIfReadOnly();
        ArgumentNullException.ThrowIfNull(encoder);
        ArgumentNullException.ThrowIfNull(batch);
        if (batch.Count == 0)
        {
            return;
        }

        lock (writerGate)
        {
            AppendAndCommitLocked(encoder, batch, append, countOf);
        }

        files.DeletePending();
    }

    /// <summary>REQUIRES: <c>writerGate</c> is held.</summary>
    private void AppendAndCommitLocked<TVectors>(
        EncoderIdentity encoder,
        IReadOnlyList<(PageKey Key, TVectors Vectors)> batch,
        Func<SegmentWriter, PageKey, TVectors, RecordLocation> append,
        Func<TVectors, int> countOf)
    {
        var writer = WriterFor(encoder);
        var segment = catalog.Segments.Find(writer.SegmentId) ?? new SegmentRecord
        {
            Id = writer.SegmentId,
            EncoderId = encoder.Id,
            Dimensions = encoder.Dimensions,
            CreatedUtc = writer.Header.Created.UtcDateTime,
        };
        var added = new List<VectorSetRecord>(batch.Count);
        try
        {
            foreach (var (key, vectors) in batch)
            {
                var location = append(writer, key, vectors);
                added.Add(new VectorSetRecord
                {
                    Id = VectorSetRecord.MakeId(encoder.Id, key.Hex),
                    EncoderId = encoder.Id,
                    PageKey = key.Hex,
                    SegmentId = location.SegmentId,
                    Offset = location.Offset,
                    Length = location.Length,
                    Checksum = location.Checksum,
                    VectorCount = countOf(vectors),
                });
            }

            writer.Flush(durable: true);
        }
        catch (IOException)
        {
            DropWriter(encoder.Id);
            throw;
        }

        segment.Length = writer.Length;
        catalog.CommitEmbedded(segment, added, batch.Select(b => b.Key.Hex).ToList());
        if (writer.ShouldSeal)
        {
            Seal(encoder.Id);
        }
    }

    /// <summary>Seals every open segment (at shutdown, or before compaction takes them).</summary>
    public void SealAll()
    {
        RefuseIfReadOnly();
        lock (writerGate)
        {
            SealAllLocked();
        }
    }

    /// <summary>The creation time of the oldest open segment this process writes, or null when none is open.</summary>
    public DateTimeOffset? OldestOpenSince()
    {
        lock (writerGate)
        {
            return writers.Count == 0 ? null : writers.Values.Min(w => w.Header.Created);
        }
    }

    /// <summary>REQUIRES: <c>writerGate</c> is held.</summary>
    private void SealAllLocked()
    {
        // A segment left open by an earlier process (each command is one) has no writer here yet.
        foreach (var open in catalog.Segments.All().Where(s => !s.Sealed && !writers.ContainsKey(s.EncoderId)))
        {
            var path = SegmentFileNames.PathOf(Directory, open.Id);
            if (File.Exists(path))
            {
                writers[open.EncoderId] = SegmentWriter.Reopen(path, writerOptions, committedLength: open.Length);
            }
        }

        foreach (var encoderId in writers.Keys.ToList())
        {
            Seal(encoderId);
        }
    }

    /// <summary>
    /// The live vector sets of an encoder for search; the result holds the files it reads until disposed
    /// (compaction then deletes them). Ordinal i is <see cref="LiveVectors.Records"/>[i].
    /// </summary>
    public LiveVectors OpenLive(string encoderId)
    {
        FlushWritersForReaders();
        lock (swapGate)
        {
            var records = catalog.VectorSets.Live(encoderId);
            return new LiveVectors(files.OpenSource(encoderId, records.Select(ToLocation).ToList()), records);
        }
    }

    /// <summary>Some vector sets of an encoder (canaries), opened as <see cref="OpenLive"/> opens them all.</summary>
    public LiveVectors OpenSelected(string encoderId, IReadOnlyList<VectorSetRecord> records)
    {
        ArgumentNullException.ThrowIfNull(records);
        FlushWritersForReaders();
        lock (swapGate)
        {
            return new LiveVectors(files.OpenSource(encoderId, records.Select(ToLocation).ToList()), records);
        }
    }

    /// <summary>
    /// Lets go of the segment pages this process holds resident (<see cref="SegmentFileSet.DropResident"/>) when
    /// the mapped-file bytes resident in it exceed <paramref name="budgetBytes"/>; returns whether it did. Reads only.
    /// </summary>
    public bool TrimResident(long budgetBytes)
    {
        if (ResidentPages.FileBytes() <= budgetBytes)
        {
            return false;
        }

        files.DropResident();
        return true;
    }

    /// <summary>
    /// Lets go of the segment pages this process holds resident (<see cref="SegmentFileSet.DropResident"/>) whatever
    /// their count: for a caller that counts its own reads. Reads only.
    /// </summary>
    public void DropResident() => files.DropResident();

    /// <summary>Readers map the files, so bytes still in a writer's buffer must reach the file first.</summary>
    private void FlushWritersForReaders()
    {
        lock (writerGate)
        {
            foreach (var writer in writers.Values)
            {
                writer.Flush(durable: false);
            }
        }
    }

    /// <summary>
    /// Runs the compaction policy and every job it asks for; returns what was done. When there is work the
    /// open segments are sealed first (compaction rewrites only immutable files), so the jobs are those
    /// <see cref="CompactionJobs.Due"/> told the daemon and <c>plan</c>.
    /// </summary>
    public CompactionReport Compact(CompactionOptions options, CancellationToken cancellationToken)
    {
        RefuseIfReadOnly();
        ArgumentNullException.ThrowIfNull(options);
        var jobs = CompactionJobs.Due(catalog, options);
        if (jobs.Count > 0)
        {
            SealAll();
            jobs = CompactionJobs.Due(catalog, options);
        }

        using var activity = jobs.Count > 0 ? CoreTelemetry.Traces.StartActivity("compaction") : null;
        activity?.SetTag("indexkeeper.jobs", jobs.Count);
        var compactor = new SegmentCompactor(Directory, catalog.Segments.AllocateId, options);
        long read = 0, written = 0, reclaimed = 0;
        foreach (var job in jobs)
        {
            cancellationToken.ThrowIfCancellationRequested();
            var live = job.SegmentIds.SelectMany(catalog.VectorSets.OfSegment).Where(v => v.Live).Select(ToLocation).ToList();
            var result = compactor.Run(job, live, cancellationToken);
            var dimensions = catalog.Segments.Find(job.SegmentIds[0])!.Dimensions;
            var newSegments = result.NewSegments.Select(n => new SegmentRecord
            {
                Id = n.SegmentId,
                EncoderId = job.EncoderId,
                Dimensions = dimensions,
                Sealed = true,
                Length = n.Length,
                RecordCount = n.RecordCount,
                LiveRecordCount = n.RecordCount,
                LiveBytes = result.Moves.Where(m => m.Value.SegmentId == n.SegmentId).Sum(m => (long)m.Value.Length),
                CreatedUtc = DateTime.UtcNow,
            }).ToList();
            lock (swapGate)
            {
                try
                {
                    FaultInjection.Reach(FaultPoints.CompactionSwapBeforeCommit);
                    catalog.SwapCompacted(
                        job.SegmentIds,
                        newSegments,
                        result.Moves.ToDictionary(m => (m.Key.SegmentId, m.Key.Offset), m => (m.Value.SegmentId, m.Value.Offset)));
                }
                catch
                {
                    SegmentCompactor.Discard(result);
                    throw;
                }

                FaultInjection.Reach(FaultPoints.CompactionSwapAfterCommit);
                foreach (var old in job.SegmentIds)
                {
                    files.Retire(old);
                }
            }

            read += result.BytesRead;
            written += result.BytesWritten;
            reclaimed += job.InputBytes - result.BytesWritten;
        }

        files.DeletePending();
        if (jobs.Count > 0)
        {
            CoreTelemetry.CompactionBytes.Add(read, new KeyValuePair<string, object?>("kind", "read"));
            CoreTelemetry.CompactionBytes.Add(written, new KeyValuePair<string, object?>("kind", "written"));
            CoreTelemetry.CompactionBytes.Add(reclaimed, new KeyValuePair<string, object?>("kind", "reclaimed"));
        }

        return new CompactionReport(jobs.Count, jobs.Sum(j => j.SegmentIds.Count), read, written, reclaimed);
    }

    public void Dispose()
    {
        lock (writerGate)
        {
            foreach (var writer in writers.Values)
            {
                writer.Dispose();
            }

            writers.Clear();
        }

        if (!ReadOnly)
        {
            // What is still put off stays listed as retired in the catalog; the next writing open deletes it.
            files.DeletePending();
        }

        files.Dispose();
    }

    private void RefuseIfReadOnly()
    {
        if (ReadOnly)
        {
            throw new InvalidOperationException("This segment store was opened for reading only; a command that writes opens it with Open.");
        }
    }

    private static RecordLocation ToLocation(VectorSetRecord v) => new(v.SegmentId, v.Offset, v.Length, unchecked((uint)v.Checksum));

    private SegmentWriter WriterFor(EncoderIdentity encoder)
    {
        if (writers.TryGetValue(encoder.Id, out var writer))
        {
            return writer;
        }

        catalog.Encoders.Register(encoder);
        // An open segment whose file is missing stays in the catalog as damage until `repair`; appends go to another.
        if (catalog.Segments.All().FirstOrDefault(s => s.EncoderId == encoder.Id && !s.Sealed && File.Exists(SegmentFileNames.PathOf(Directory, s.Id))) is { } open)
        {
            writer = SegmentWriter.Reopen(SegmentFileNames.PathOf(Directory, open.Id), writerOptions, committedLength: open.Length);
        }
        else
        {
            var header = new SegmentHeader(catalog.Segments.AllocateId(), encoder.Id, encoder.Dimensions, DateTimeOffset.UtcNow);
            writer = SegmentWriter.Create(Directory, header, writerOptions);
        }

        writers[encoder.Id] = writer;
        return writer;
    }

    private void Seal(string encoderId)
    {
        if (!writers.Remove(encoderId, out var writer))
        {
            return;
        }

        using (writer)
        {
            if (catalog.Segments.Find(writer.SegmentId) is not { } segment)
            {
                // Nothing was ever committed to it: an orphan that recovery removes.
                return;
            }

            var sealedSegment = writer.Seal();
            segment.Sealed = true;
            segment.Length = sealedSegment.Length;
            catalog.Segments.Put(segment);
        }
    }

    private void DropWriter(string encoderId)
    {
        if (writers.Remove(encoderId, out var writer))
        {
            writer.Dispose();
        }

        StoreRecovery.CutToCommitted(catalog, Directory);
    }
}
