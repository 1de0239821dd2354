using IndexKeeper.Core.Storage;

namespace IndexKeeper.Core.Compaction;

/// <summary>
/// Runs compaction jobs: copies the live records of a job's segments, byte for byte, into new sealed
/// segments (no re-encoding; each record's checksums are verified as it is read). Outputs are written
/// under temp names and get their real names only when sealed and fsynced.
/// Order of a compaction (docs/compaction.md):
/// <list type="number">
/// <item><see cref="Run"/> writes and seals the new segments.</item>
/// <item>The caller commits the catalog transaction that applies the moves and drops the old segments;
/// if that fails, it calls <see cref="Discard"/>.</item>
/// <item>The caller retires the old segments through <see cref="SegmentFileSet.Retire"/>; each is deleted
/// when its last reader lets go.</item>
/// </list>
/// </summary>
public sealed class SegmentCompactor
{
    private readonly string directory;
    private readonly Func<long> allocateSegmentId;
    private readonly CompactionOptions options;
    private readonly TimeProvider time;

    /// <param name="allocateSegmentId">Hands out a fresh, never-used segment id (the catalog owns the counter).</param>
    public SegmentCompactor(string directory, Func<long> allocateSegmentId, CompactionOptions options, TimeProvider? time = null)
    {
        ArgumentException.ThrowIfNullOrEmpty(directory);
        ArgumentNullException.ThrowIfNull(allocateSegmentId);
        ArgumentNullException.ThrowIfNull(options);
        options.ThrowIfInvalid();
        this.directory = directory;
        this.allocateSegmentId = allocateSegmentId;
        this.options = options;
        this.time = time ?? TimeProvider.System;
    }

    /// <summary>
    /// Copies <paramref name="liveRecords"/> (every live record of the job's segments, as the catalog
    /// knows them) into new segments. A bad record fails the job with <see cref="SegmentFormatException"/>
    /// and leaves no new file behind.
    /// </summary>
    public CompactionResult Run(CompactionJob job, IReadOnlyList<RecordLocation> liveRecords, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(job);
        ArgumentNullException.ThrowIfNull(liveRecords);
        var order = job.SegmentIds.Select((id, index) => (id, index)).ToDictionary(p => p.id, p => p.index);
        foreach (var record in liveRecords.Where(r => !order.ContainsKey(r.SegmentId)))
        {
            throw new ArgumentException($"live record at {record} is not in a segment of this job.", nameof(liveRecords));
        }

        var records = liveRecords.Distinct().OrderBy(r => order[r.SegmentId]).ThenBy(r => r.Offset).ToList();
        var readers = new Dictionary<long, SegmentReader>();
        var outputs = new List<SealedSegment>();
        var moves = new Dictionary<RecordLocation, RecordLocation>();
        SegmentWriter? writer = null;
        long bytesRead = 0;
        try
        {
            foreach (var record in records)
            {
                cancellationToken.ThrowIfCancellationRequested();
                var reader = ReaderOf(readers, record.SegmentId, job.EncoderId);
                var bytes = reader.ReadRecord(record);
                writer ??= SegmentWriter.CreateTemporary(directory, new SegmentHeader(allocateSegmentId(), job.EncoderId, reader.Header.Dimensions, time.GetUtcNow()), null, time);
                if (writer.Header.Dimensions != reader.Header.Dimensions)
                {
                    throw new SegmentFormatException(reader.Path, null, $"segment has {reader.Header.Dimensions} dimensions, others of this job have {writer.Header.Dimensions}");
                }

                moves[record] = writer.AppendVerbatim(bytes);
                bytesRead += bytes.Length;
                if (writer.Length >= options.TargetSegmentBytes)
                {
                    outputs.Add(writer.Seal());
                    writer.Dispose();
                    writer = null;
                }
            }

            if (writer is not null)
            {
                outputs.Add(writer.Seal());
                writer.Dispose();
                writer = null;
            }

            return new CompactionResult(job, moves, outputs, bytesRead, outputs.Sum(o => o.Length));
        }
        catch
        {
            writer?.Dispose();
            DeleteSealed(outputs);
            throw;
        }
        finally
        {
            foreach (var reader in readers.Values)
            {
                reader.Dispose();
            }
        }
    }

    /// <summary>Deletes the new segments of a result whose catalog transaction did not commit.</summary>
    public static void Discard(CompactionResult result)
    {
        ArgumentNullException.ThrowIfNull(result);
        DeleteSealed(result.NewSegments);
    }

    private static void DeleteSealed(IEnumerable<SealedSegment> segments)
    {
        foreach (var segment in segments)
        {
            if (OperatingSystem.IsWindows() && File.Exists(segment.Path))
            {
                File.SetAttributes(segment.Path, File.GetAttributes(segment.Path) & ~FileAttributes.ReadOnly);
            }

            File.Delete(segment.Path);
        }
    }

    private SegmentReader ReaderOf(Dictionary<long, SegmentReader> readers, long segmentId, string encoderId)
    {
        if (!readers.TryGetValue(segmentId, out var reader))
        {
            reader = SegmentReader.Open(SegmentFileNames.PathOf(directory, segmentId));
            readers[segmentId] = reader;
            if (reader.Header.EncoderId != encoderId || reader.Header.SegmentId != segmentId)
            {
                throw new SegmentFormatException(reader.Path, null, $"header names segment {reader.Header.SegmentId} of encoder {reader.Header.EncoderId}, the job expects segment {segmentId} of {encoderId}");
            }
        }

        return reader;
    }
}
