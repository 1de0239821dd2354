using IndexKeeper.Core.Compaction;
using IndexKeeper.Core.Index;

namespace IndexKeeper.Service.Application;

/// <summary>
/// <c>compact</c>, the daemon's compaction and the plan's forecast of it: one policy over one set of
/// segment figures (docs/compaction.md), so what <c>plan</c> says is due is what runs.
/// </summary>
public sealed class CompactOperation(OpenIndex index, IndexSettings settings)
{
    /// <summary>The jobs the policy would run now; reads only.</summary>
    public IReadOnlyList<CompactionJob> Jobs() => CompactionJobs.Due(index.Catalog, settings.Compaction);

    /// <summary>Seals the open segments and rewrites what the policy picks.</summary>
    /// <remarks>REQUIRES: the index is open for writing and nothing else writes it.</remarks>
    public CompactionReport Run(CancellationToken cancellationToken)
    {
        index.Store.SealAll();
        return index.Store.Compact(settings.Compaction, cancellationToken);
    }
}
