using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Core.Index;

/// <summary>An open view of the live vector sets of one encoder, and the catalog record of each ordinal.</summary>
public sealed class LiveVectors(SegmentVectorSetSource source, IReadOnlyList<VectorSetRecord> records) : IDisposable
{
    public IVectorSetSource Source => source;

    public IReadOnlyList<VectorSetRecord> Records { get; } = records;

    public void Dispose() => source.Dispose();
}
