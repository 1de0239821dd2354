using System.Diagnostics;
using System.Globalization;
using IndexKeeper.Core.Compaction;
using IndexKeeper.Core.Index;
using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Storage;
using IndexKeeper.Service.Configuration;
using IndexKeeper.Service.Application;

namespace IndexKeeper.Churn.Strategies;

/// <summary>
/// Strategy (c): the real IndexKeeper on a real index directory. Each day is one <c>sync</c> as the
/// command runs it (the composed index with its reader worker, the scan, the embed batches) followed by a
/// compaction as the <c>compact</c> command runs it (seal the open segment, then the policy).
/// </summary>
internal sealed class KeeperIndex(string indexDirectory, string rootDirectory)
{
    public const string RootName = "drive";

    public string IndexDirectory => indexDirectory;

    public static IndexKeeperOptions Options(string indexDirectory, string rootDirectory, int dimensions) => OptionsLoader.Load(new ConfigurationSources(
        null,
        indexDirectory,
        [],
        [
            "Detect:SettleSeconds=0",
            "Encoder:Name=hashed-terms",
            "Encoder:Dimensions=" + dimensions.ToString(CultureInfo.InvariantCulture),
            "Roots:0:Name=" + RootName,
            "Roots:0:Path=" + rootDirectory,
        ]));

    public IndexComposition Open(int dimensions, string purpose) => IndexComposition.Open(Options(indexDirectory, rootDirectory, dimensions), purpose);

    /// <summary>One sync (the steps of <see cref="SyncOperation"/>: scan, drift, embed, drift, timed apart) and one compaction (the <c>compact</c> command's).</summary>
    public KeeperDay Sync(int dimensions, bool compact)
    {
        using var composed = Open(dimensions, "churn simulation");
        _ = composed.Index.Store;
        var before = SegmentBytes(composed.Index.Catalog);
        var stopwatch = Stopwatch.StartNew();

        // A changed encoder id is declared drift: held pages are queued for migration, the old vectors serve
        // until every page has new ones, then the index switches over (docs/encoders.md).
        var summary = composed.Get<ScanOperation>().Run("churn sync", null, CancellationToken.None);
        var scanSeconds = stopwatch.Elapsed.TotalSeconds;
        composed.Get<EmbedBatchOperation>().RunAll(summary, null, CancellationToken.None);
        summary.RecordDrift(composed.Get<DriftOperation>().Reconcile());
        var syncSeconds = stopwatch.Elapsed.TotalSeconds;
        var ingested = SegmentBytes(composed.Index.Catalog) - before;
        CompactionReport? compaction = compact ? composed.Get<CompactOperation>().Run(CancellationToken.None) : null;

        if (summary.PagesFailed != 0 || summary.DocumentsQuarantined != 0 || summary.DocumentsDeferred != 0)
        {
            throw new InvalidOperationException($"sync: {summary.PagesFailed} pages failed, {summary.DocumentsQuarantined} quarantined, {summary.DocumentsDeferred} deferred: {string.Join("; ", summary.Problems)}");
        }

        return new KeeperDay(summary, scanSeconds, syncSeconds, ingested, compaction?.BytesWritten ?? 0, stopwatch.Elapsed.TotalSeconds);
    }

    /// <summary>Bytes of every file of the index directory: catalog, segments, lock.</summary>
    public long BytesOnDisk() => new DirectoryInfo(indexDirectory).EnumerateFiles("*", SearchOption.AllDirectories).Sum(f => f.Length);

    public long SegmentBytesOnDisk() =>
        new DirectoryInfo(Path.Combine(indexDirectory, VectorStore.SegmentsFolder)).EnumerateFiles(SegmentFileNames.SearchPattern).Sum(f => f.Length);

    private static long SegmentBytes(IndexCatalog catalog) => catalog.Segments.All().Sum(s => s.Length);
}
