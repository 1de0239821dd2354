using IndexKeeper.Core.Documents;

namespace IndexKeeper.Core.Storage;

/// <summary>
/// Live vector sets read in place from mapped segments, as search reads them. <see cref="Get"/> does no
/// I/O, no checking and no allocation: every record was checked when the source was opened. Safe for
/// any number of concurrent readers. REQUIRES: <see cref="Dispose"/> is called only after every reader
/// is done with the spans it got; disposing lets compaction delete the files behind them.
/// </summary>
public sealed class SegmentVectorSetSource : IVectorSetSource, IDisposable
{
    private readonly MappedFile[] maps;
    private readonly Ordinal[] ordinals;
    private int disposed;

    internal SegmentVectorSetSource(string encoderId, int dimensions, MappedFile[] maps, Ordinal[] ordinals, IReadOnlyList<UnreadableRecord> unreadable)
    {
        Unreadable = unreadable;
        EncoderId = encoderId;
        Dimensions = dimensions;
        this.maps = maps;
        this.ordinals = ordinals;
    }

    public string EncoderId { get; }

    /// <summary>The dimension count of every vector set here (0 when the source is empty).</summary>
    public int Dimensions { get; }

    public int Count => ordinals.Length;

    /// <summary>The locations asked for that cannot be read (missing file, bad header, bad record); not among the ordinals.</summary>
    public IReadOnlyList<UnreadableRecord> Unreadable { get; }

    public StoredVectors Get(int ordinal)
    {
        ObjectDisposedException.ThrowIf(Volatile.Read(ref disposed) != 0, this);
        var at = ordinals[ordinal];
        return RecordCodec.View(maps[at.Map].Span(at.BodyOffset, at.BodyLength), Dimensions, at.VectorCount, at.Key);
    }

    public void Dispose()
    {
        if (Interlocked.Exchange(ref disposed, 1) != 0)
        {
            return;
        }

        foreach (var map in maps)
        {
            map.Release();
        }
    }

    internal readonly record struct Ordinal(int Map, long BodyOffset, int BodyLength, int VectorCount, PageKey Key);
}
