using IndexKeeper.Core.Compaction;
using IndexKeeper.Core.Index;

namespace IndexKeeper.Service.Application;

/// <summary>
/// <c>compact</c>, the daemon's compaction and the plan's forecast of it: one policy over one set of
/// segment figures and one over the page-word files (docs/compaction.md), so what <c>plan</c> says is due is what runs.
/// </summary>
public sealed class CompactOperation(OpenIndex index, IndexSettings settings)
{
    /// <summary>The segment jobs the policy would run now; reads only.</summary>
    public IReadOnlyList<CompactionJob> Jobs() => CompactionJobs.Due(index.Catalog, settings.Compaction);

    /// <summary>The page-word files the policy would rewrite or delete now; reads only (one pass over the page records).</summary>
    public IReadOnlyList<WordFileStats> WordFiles() => WordCompaction.Due(index.Catalog, index.Words, settings.Compaction);

    /// <summary>Seals the open segments and rewrites what the policy picks, segments first, then page-word files.</summary>
    /// <remarks>REQUIRES: the index is open for writing and nothing else writes it.</remarks>
    public CompactionReport Run(CancellationToken cancellationToken)
    {
        index.Store.SealAll();
        var report = index.Store.Compact(settings.Compaction, cancellationToken);
        return report with { Words = WordCompaction.Run(index.Catalog, index.Words, index.Directory, settings.Compaction, cancellationToken) };
    }
}
