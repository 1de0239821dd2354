using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Detect;
using IndexKeeper.Core.Compaction;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Documents.Isolation;
using IndexKeeper.Core.Drift;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Index;
using IndexKeeper.Core.Pipeline;
using IndexKeeper.Core.Storage;
using IndexKeeper.Service.Configuration;

namespace IndexKeeper.Service.Hosting;

/// <summary>
/// An open index for one command or one daemon: the lock, the catalog and the reader, released together.
/// The lock is taken first and released last, so no other process ever sees the catalog open.
/// </summary>
public sealed class IndexSession : IDisposable
{
    private readonly IndexLock indexLock;
    private VectorStore? store;
    private IPageEncoder? encoder;

    private IndexSession(IndexKeeperOptions options, IndexLock indexLock, IndexCatalog catalog, IDocumentReader reader, bool readOnly = false)
    {
        ReadOnly = readOnly;
        Options = options;
        this.indexLock = indexLock;
        Catalog = catalog;
        Reader = reader;
    }

    public IndexKeeperOptions Options { get; }

    /// <summary>Opened by <see cref="OpenReadOnly"/>: the catalog cannot be written and the store is not opened.</summary>
    public bool ReadOnly { get; }

    public IndexCatalog Catalog { get; }

    public IDocumentReader Reader { get; }

    public string IndexDirectory => indexLock.Directory;

    /// <summary>The segment store, opened on first use: for reading only in a read-only session (nothing repaired), else repaired after a crash.</summary>
    public VectorStore Store => ReadOnly
        ? store ??= VectorStore.OpenForReading(Catalog, IndexDirectory)
        : store ??= VectorStore.Open(Catalog, IndexDirectory, new SegmentWriterOptions
    {
        SealAtBytes = Options.Storage.SealAtMegabytes * 1024 * 1024,
        SealAtAge = TimeSpan.FromHours(Options.Storage.SealAtHours),
    });

    /// <summary>The active encoder, built on first use.</summary>
    public IPageEncoder Encoder => encoder ??= EncoderFactory.Create(Options.Encoder);

    public IReadOnlyDictionary<string, string> RootPaths =>
        Options.Roots.ToDictionary(r => r.Name, r => Path.GetFullPath(r.Path), StringComparer.Ordinal);

    public CompactionOptions CompactionOptions() => new()
    {
        DeadShareThreshold = Options.Storage.CompactDeadShare,
        SmallSegmentBytes = Options.Storage.SmallSegmentMegabytes * 1024 * 1024,
        MinSmallSegmentsToMerge = Options.Storage.MinSmallSegmentsToMerge,
        TargetSegmentBytes = Options.Storage.SealAtMegabytes * 1024 * 1024,
    };

    public CanarySettings CanarySettings() => new(
        Options.Drift.CanaryPages,
        Options.Drift.CanaryMinimumMeanCosine,
        Options.Drift.CanaryMinimumCosine);

    /// <summary>Records the active encoder and applies declared drift: queues drifted pages, switches over when complete.</summary>
    public DriftDecision ReconcileDrift() =>
        DriftReconciler.Reconcile(Catalog, Encoder.Identity, EncoderSettings.Record(Options.Encoder), DateTime.UtcNow);

    /// <summary>
    /// Re-embeds the canary pages with the active encoder and records the figures (docs/encoders.md,
    /// "Canaries"); the daemon calls this every <c>Drift:CanaryIntervalHours</c>.
    /// </summary>
    public CanaryFigures CheckCanaries(CancellationToken cancellationToken) =>
        CanaryCheck.Run(Catalog, Store, Encoder, RootPaths, CanarySettings(), DateTime.UtcNow, cancellationToken);

    /// <summary>Whether the active encoder's canaries are due for a check (<c>Drift:CanaryIntervalHours</c>); off when <c>Drift:CanaryPages</c> is 0.</summary>
    public bool CanariesDue(DateTime nowUtc) =>
        Options.Drift.CanaryPages > 0 &&
        CanarySchedule.IsDue(Catalog.Encoders.Find(Encoder.Identity.Id)?.CanaryCheckedUtc?.ToUniversalTime(), TimeSpan.FromHours(Options.Drift.CanaryIntervalHours), nowUtc);

    /// <summary>The drift state as <see cref="ReconcileDrift"/> would see it, without writing.</summary>
    public DriftDecision ReadDrift() => DriftReconciler.Read(Catalog, Encoder.Identity.Id);

    public static IndexSession Open(IndexKeeperOptions options, string purpose) => Open(options, purpose, readOnly: false);

    /// <summary>Opens for reading only (the plan): the lock is taken, the catalog file's bytes are never changed.</summary>
    public static IndexSession OpenReadOnly(IndexKeeperOptions options, string purpose) => Open(options, purpose, readOnly: true);

    /// <summary>
    /// Opens for a catalog rebuild: <paramref name="beforeCatalog"/> runs once the lock is held and before the
    /// catalog is opened (it moves the old catalog aside), so no other process sees the index in between.
    /// </summary>
    public static IndexSession OpenForRebuild(IndexKeeperOptions options, string purpose, Action<string> beforeCatalog) =>
        Open(options, purpose, readOnly: false, beforeCatalog);

    private static IndexSession Open(IndexKeeperOptions options, string purpose, bool readOnly, Action<string>? beforeCatalog = null)
    {
        ArgumentNullException.ThrowIfNull(options);
        var held = IndexLock.Acquire(options.IndexDirectory, purpose);
        try
        {
            beforeCatalog?.Invoke(held.Directory);
            var catalog = readOnly ? IndexCatalog.OpenReadOnly(held) : IndexCatalog.Open(held);
            // Documents are parsed in a worker process: a parser that crashes, hangs or blows up its memory
            // costs one quarantined document, never the command or the service.
            var reader = IsolatedReaderFactory.Create(new IsolatedReaderOptions
            {
                WorkerMemoryLimitBytes = options.Limits.WorkerMemoryMegabytes * 1024 * 1024,
            });
            return new IndexSession(options, held, catalog, reader, readOnly);
        }
        catch
        {
            held.Dispose();
            throw;
        }
    }

    public ScanSettings ScanSettings() => new(
        Options.Roots.Select(r => new RootSpec(r.Name, Path.GetFullPath(r.Path), r.Include.Count > 0 ? r.Include : RootOptions.SupportedTypes, r.Exclude)).ToList(),
        ReadLimits(),
        TimeSpan.FromSeconds(Options.Detect.SettleSeconds));

    public ReadLimits ReadLimits() => new(
        Options.Limits.MaxFileMegabytes * 1024 * 1024,
        Options.Limits.MaxPages,
        Options.Limits.MaxDecodedStreamMegabytes * 1024 * 1024,
        TimeSpan.FromSeconds(Options.Limits.ReadTimeoutSeconds));

    public void Dispose()
    {
        store?.Dispose();
        (encoder as IDisposable)?.Dispose();
        (Reader as IDisposable)?.Dispose();
        Catalog.Dispose();
        indexLock.Dispose();
    }
}
