using System.Collections.Concurrent;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Faults;

namespace IndexKeeper.Core.Storage;

/// <summary>
/// The segment files of one index directory as readers share them: maps are opened once, handed out
/// with a reference count, and a segment that compaction retired is deleted only when its last reader
/// lets go.
/// <para>Rules (see docs/compaction.md, "Deleting old segments"):</para>
/// <list type="bullet">
/// <item>The set holds one reference to the newest map of each segment; every open
/// <see cref="SegmentVectorSetSource"/> holds one to each map it reads.</item>
/// <item><see cref="Retire"/> is called after the catalog transaction that stopped referencing a
/// segment. It drops the set's reference; the file is deleted when the count of its last map reaches
/// zero. A retired segment cannot be opened again.</item>
/// <item>An open segment grows; a source that needs bytes past the current map gets a new, longer map,
/// and older maps live on until their sources are disposed.</item>
/// <item>Readers in other processes are not counted here: a delete first takes the delete gate (the reader
/// gate, exclusively, without waiting). When a reader holds it, or the delete fails (Windows refuses to
/// delete a file another process holds open), the file stays and <see cref="DeletePending"/> tries again;
/// the commit that retired it is never undone or failed by that.</item>
/// </list>
/// All members are safe to call from any thread; <c>gate</c> guards the table of entries.
/// </summary>
public sealed class SegmentFileSet : IDisposable
{
    private readonly object gate = new();
    private readonly Dictionary<long, Entry> entries = [];
    private readonly HashSet<long> pendingDeletes = [];
    private readonly Func<IDisposable?>? deleteGate;
    private bool disposed;

    /// <param name="deleteGate">Taken around each delete; null from it means another process may read the file now.</param>
    public SegmentFileSet(string directory, Func<IDisposable?>? deleteGate = null)
    {
        ArgumentException.ThrowIfNullOrEmpty(directory);
        Directory = directory;
        this.deleteGate = deleteGate;
    }

    public string Directory { get; }

    /// <summary>
    /// A source over the vector sets at <paramref name="locations"/> that can be read. Every record is
    /// checked once per set (frame, checksums, layout, encoder id) before it can be read; a bad record, or
    /// every record of a file that is missing or whose header is bad, is left out and listed in
    /// <see cref="SegmentVectorSetSource.Unreadable"/>: damage costs the records it touches, never the others.
    /// Ordinal i of the source is the i-th location not listed there, in the order given.
    /// </summary>
    public SegmentVectorSetSource OpenSource(string encoderId, IReadOnlyList<RecordLocation> locations)
    {
        ArgumentNullException.ThrowIfNull(encoderId);
        ArgumentNullException.ThrowIfNull(locations);
        var maps = new List<MappedFile>();
        var mapOfSegment = new Dictionary<long, int>();
        var failedSegments = new Dictionary<long, string>();
        try
        {
            var ends = new Dictionary<long, long>();
            foreach (var location in locations)
            {
                ends[location.SegmentId] = Math.Max(ends.GetValueOrDefault(location.SegmentId), location.Offset + location.Length);
            }

            var dimensions = 0;
            var verifiedBySegment = new Dictionary<long, ConcurrentDictionary<long, (uint Checksum, int Length)>>();
            foreach (var (segmentId, end) in ends)
            {
                MappedFile map;
                SegmentHeader header;
                ConcurrentDictionary<long, (uint Checksum, int Length)> verified;
                try
                {
                    (map, header, verified) = Acquire(segmentId, end);
                }
                catch (Exception ex) when (ex is SegmentFormatException or IOException or UnauthorizedAccessException)
                {
                    failedSegments[segmentId] = ex is FileNotFoundException ? $"segment file {SegmentFileNames.Name(segmentId)} is missing" : ex.Message;
                    continue;
                }

                var problem = header.EncoderId != encoderId
                    ? $"segment holds encoder {header.EncoderId}, the catalog expects {encoderId}"
                    : dimensions != 0 && header.Dimensions != dimensions
                        ? $"segment has {header.Dimensions} dimensions, others of encoder {encoderId} have {dimensions}"
                        : null;
                if (problem is not null)
                {
                    map.Release();
                    failedSegments[segmentId] = new SegmentFormatException(map.Path, null, problem).Message;
                    continue;
                }

                mapOfSegment[segmentId] = maps.Count;
                maps.Add(map);
                verifiedBySegment[segmentId] = verified;
                dimensions = header.Dimensions;
            }

            var ordinals = new List<SegmentVectorSetSource.Ordinal>(locations.Count);
            var unreadable = new List<UnreadableRecord>();
            for (var i = 0; i < locations.Count; i++)
            {
                var location = locations[i];
                if (failedSegments.TryGetValue(location.SegmentId, out var failure))
                {
                    unreadable.Add(new UnreadableRecord(i, location, failure));
                    continue;
                }

                var mapIndex = mapOfSegment[location.SegmentId];
                try
                {
                    var count = Check(maps[mapIndex], location, dimensions, verifiedBySegment[location.SegmentId], out var key);
                    ordinals.Add(new SegmentVectorSetSource.Ordinal(mapIndex, location.Offset + SegmentFormat.FrameLength, location.Length - SegmentFormat.FrameLength, count, key));
                }
                catch (SegmentFormatException ex)
                {
                    unreadable.Add(new UnreadableRecord(i, location, ex.Message));
                }
            }

            return new SegmentVectorSetSource(encoderId, dimensions, [.. maps], [.. ordinals], unreadable);
        }
        catch
        {
            foreach (var map in maps)
            {
                map.Release();
            }

            throw;
        }
    }

    /// <summary>
    /// REQUIRES: the catalog no longer references <paramref name="segmentId"/> (the swap is committed).
    /// The file is deleted now if no reader holds it, else when the last one is disposed.
    /// </summary>
    public void Retire(long segmentId)
    {
        MappedFile? current;
        lock (gate)
        {
            var entry = EntryOf(segmentId);
            if (entry.Retired)
            {
                return;
            }

            entry.Retired = true;
            current = entry.Current;
            entry.Current = null;
            if (current is null && entry.LiveMaps == 0)
            {
                Delete(segmentId);
                return;
            }
        }

        current?.Release();
    }

    /// <summary>Retries the deletes that a reader in another process or a refusing file system put off; returns how many are still put off.</summary>
    public int DeletePending()
    {
        lock (gate)
        {
            foreach (var segmentId in pendingDeletes.ToList())
            {
                pendingDeletes.Remove(segmentId);
                Delete(segmentId);
            }

            return pendingDeletes.Count;
        }
    }

    /// <summary>
    /// Lets go of the segment pages this process holds resident, in every current map (<see cref="MappedFile.DropResident"/>):
    /// open sources read the same bytes afterwards, from the page cache or the disk. Bounds a whole-index read
    /// (a serving view's build) and the re-ranks of a long-running daemon to what they touch between calls.
    /// </summary>
    public void DropResident()
    {
        List<MappedFile> held;
        lock (gate)
        {
            if (disposed)
            {
                return;
            }

            held = [.. entries.Values.Select(e => e.Current).OfType<MappedFile>()];
            held.ForEach(m => m.AddReference());
        }

        foreach (var map in held)
        {
            try
            {
                map.DropResident();
            }
            finally
            {
                map.Release();
            }
        }
    }

    /// <summary>Drops the set's own references; maps held by open sources stay until those are disposed.</summary>
    public void Dispose()
    {
        List<MappedFile> held;
        lock (gate)
        {
            if (disposed)
            {
                return;
            }

            disposed = true;
            held = [.. entries.Values.Select(e => e.Current).OfType<MappedFile>()];
            foreach (var entry in entries.Values)
            {
                entry.Current = null;
            }
        }

        foreach (var map in held)
        {
            map.Release();
        }
    }

    private static int Check(MappedFile map, RecordLocation location, int dimensions, ConcurrentDictionary<long, (uint Checksum, int Length)> verified, out PageKey key)
    {
        if (location.Length < SegmentFormat.FrameLength + SegmentFormat.VectorSetPrefixLength || location.Offset < SegmentFormat.MinHeaderLength
            || location.Offset > map.Length - location.Length)
        {
            throw new SegmentFormatException(map.Path, location.Offset, $"record of {location.Length} bytes lies outside the {map.Length}-byte file");
        }

        var record = map.Span(location.Offset, location.Length);
        var body = record[SegmentFormat.FrameLength..];
        if (!verified.TryGetValue(location.Offset, out var known) || known != (location.Checksum, location.Length))
        {
            var state = RecordCodec.Examine(record, out var type, out var recordLength, out var checksum, out var problem);
            if (state != RecordCodec.FrameState.Complete)
            {
                throw new SegmentFormatException(map.Path, location.Offset, state == RecordCodec.FrameState.Damaged ? problem : "record is incomplete");
            }

            if (type != SegmentFormat.RecordTypeVectorSet || recordLength != location.Length || checksum != location.Checksum)
            {
                throw new SegmentFormatException(map.Path, location.Offset, "the record here is not the one the location names (type, length or checksum differ)");
            }

            if (RecordCodec.CheckVectorSetBody(body, dimensions, out problem) < 0)
            {
                throw new SegmentFormatException(map.Path, location.Offset, problem);
            }

            verified[location.Offset] = (location.Checksum, location.Length);
        }

        key = PageKey.FromHash(body[..PageKey.ByteLength]);
        return (location.Length - SegmentFormat.FrameLength - SegmentFormat.VectorSetPrefixLength) / SegmentFormat.BytesPerVector(dimensions);
    }

    private (MappedFile Map, SegmentHeader Header, ConcurrentDictionary<long, (uint Checksum, int Length)> Verified) Acquire(long segmentId, long end)
    {
        lock (gate)
        {
            ObjectDisposedException.ThrowIf(disposed, this);
            var entry = EntryOf(segmentId);
            if (entry.Retired)
            {
                throw new InvalidOperationException($"segment {segmentId} is retired and can no longer be read.");
            }

            if (entry.Current is null || entry.Current.Length < end)
            {
                var path = SegmentFileNames.PathOf(Directory, segmentId);
                var map = MappedFile.Open(path, _ => Unmapped(segmentId));
                entry.LiveMaps++;
                try
                {
                    var header = SegmentHeader.Decode(map.Span(0, (int)Math.Min(map.Length, SegmentFormat.MaxHeaderLength)), path);
                    if (header.SegmentId != segmentId)
                    {
                        throw new SegmentFormatException(path, null, $"the header names segment {header.SegmentId}");
                    }

                    if (map.Length < end)
                    {
                        throw new SegmentFormatException(path, null, $"the catalog references bytes up to {end}, the file has {map.Length}");
                    }

                    entry.Header = header;
                }
                catch
                {
                    map.Release();
                    throw;
                }

                var previous = entry.Current;
                entry.Current = map;
                previous?.Release();
            }

            entry.Current.AddReference();
            return (entry.Current, entry.Header!, entry.Verified);
        }
    }

    private void Unmapped(long segmentId)
    {
        lock (gate)
        {
            var entry = entries[segmentId];
            entry.LiveMaps--;
            if (entry.Retired && entry.LiveMaps == 0)
            {
                Delete(segmentId);
            }
        }
    }

    /// <summary>REQUIRES: gate is held and no map of the segment is alive in this process.</summary>
    private void Delete(long segmentId)
    {
        using var readersOut = deleteGate?.Invoke();
        if (deleteGate is not null && readersOut is null)
        {
            // A reader in another process opened its catalog before the swap and may still map this file.
            pendingDeletes.Add(segmentId);
            return;
        }

        var path = SegmentFileNames.PathOf(Directory, segmentId);

        // A delete that a crash undoes is harmless: the next writing open deletes files the catalog lists as retired.
        FaultInjection.Reach(FaultPoints.CompactionDeleteBefore);
        try
        {
            if (OperatingSystem.IsWindows() && File.Exists(path))
            {
                File.SetAttributes(path, File.GetAttributes(path) & ~FileAttributes.ReadOnly);
            }

            File.Delete(path);
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            // Windows refuses while any process holds the file; the swap stays committed, the delete waits.
            pendingDeletes.Add(segmentId);
            return;
        }

        FaultInjection.Reach(FaultPoints.CompactionDeleteAfter);
    }

    private Entry EntryOf(long segmentId)
    {
        if (!entries.TryGetValue(segmentId, out var entry))
        {
            entry = new Entry();
            entries[segmentId] = entry;
        }

        return entry;
    }

    private sealed class Entry
    {
        /// <summary>The newest map; the set holds one reference to it.</summary>
        public MappedFile? Current { get; set; }

        public SegmentHeader? Header { get; set; }

        /// <summary>Maps of this segment not yet unmapped (the current one and older ones still held).</summary>
        public int LiveMaps { get; set; }

        public bool Retired { get; set; }

        /// <summary>Record offsets already checked, with checksum and length: bytes at an offset never change.</summary>
        public ConcurrentDictionary<long, (uint Checksum, int Length)> Verified { get; } = new();
    }
}
