using System.Diagnostics;
using System.Globalization;
using IndexKeeper.Core.Compaction;
using IndexKeeper.Core.Index;
using IndexKeeper.Core.Pipeline;
using IndexKeeper.Core.Storage;
using IndexKeeper.Service.Configuration;
using IndexKeeper.Service.Hosting;

namespace IndexKeeper.Churn.Strategies;

/// <summary>
/// Strategy (c): the real IndexKeeper on a real index directory. Each day is one <c>sync</c> as the
/// command runs it (the session with its reader worker, the scan pass, the embed pass) followed by a
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

    public IndexSession Open(int dimensions, string purpose) => IndexSession.Open(Options(indexDirectory, rootDirectory, dimensions), purpose);

    /// <summary>One sync (as the <c>sync</c> command does it: scan, drift, embed, drift) and one compaction.</summary>
    public KeeperDay Sync(int dimensions, bool compact)
    {
        using var session = Open(dimensions, "churn simulation");
        var store = session.Store;
        var before = SegmentBytes(session);
        var stopwatch = Stopwatch.StartNew();
        var summary = new ScanPass(session.Catalog, session.Reader, session.ScanSettings()).Run("churn sync", CancellationToken.None);
        var scanSeconds = stopwatch.Elapsed.TotalSeconds;
        // A changed encoder id is declared drift: held pages are queued for migration, the old vectors serve
        // until every page has new ones, then the index switches over (docs/encoders.md).
        summary.RecordDrift(session.ReconcileDrift());
        new EmbedPass(session.Catalog, store, session.Encoder, session.RootPaths, session.Options.Encoder.BatchSize).Run(summary, CancellationToken.None);
        summary.RecordDrift(session.ReconcileDrift());
        var syncSeconds = stopwatch.Elapsed.TotalSeconds;
        var ingested = SegmentBytes(session) - before;
        CompactionReport? compaction = null;
        if (compact)
        {
            store.SealAll();
            compaction = store.Compact(session.CompactionOptions(), CancellationToken.None);
        }

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

    private static long SegmentBytes(IndexSession session) => session.Catalog.Segments.All().Sum(s => s.Length);
}
