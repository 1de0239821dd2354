using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Core.Index;

/// <summary>
/// An open view of the live vector sets of one encoder that can be read, and the catalog record of each
/// ordinal. Vector sets whose bytes cannot be read are left out and listed in <see cref="Unreadable"/>;
/// nothing is repaired here (reads never write).
/// </summary>
public sealed class LiveVectors : IDisposable
{
    private readonly SegmentVectorSetSource source;

    public LiveVectors(SegmentVectorSetSource source, IReadOnlyList<VectorSetRecord> records)
    {
        ArgumentNullException.ThrowIfNull(source);
        ArgumentNullException.ThrowIfNull(records);
        this.source = source;
        var left = source.Unreadable.Select(u => u.Index).ToHashSet();
        Records = left.Count == 0 ? records : records.Where((_, i) => !left.Contains(i)).ToList();
        Unreadable = source.Unreadable.Select(u => (records[u.Index], u.Problem)).ToList();
    }

    public IVectorSetSource Source => source;

    /// <summary>Ordinal i of <see cref="Source"/> is Records[i].</summary>
    public IReadOnlyList<VectorSetRecord> Records { get; }

    /// <summary>Live vector sets whose bytes cannot be read, with the reason.</summary>
    public IReadOnlyList<(VectorSetRecord Record, string Problem)> Unreadable { get; }

    public void Dispose() => source.Dispose();
}
