using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Compaction;
using IndexKeeper.Core.Detect;
using IndexKeeper.Core.Documents.Isolation;
using IndexKeeper.Core.Drift;
using IndexKeeper.Core.Pipeline;
using IndexKeeper.Core.Scheduling;
using IndexKeeper.Core.Search;
using IndexKeeper.Core.Storage;
using IndexKeeper.Service.Configuration;
using IndexKeeper.Service.Hosting;

namespace IndexKeeper.Service.Application;

/// <summary>
/// The validated settings mapped to what each concern of the index needs, once, when a command or the
/// daemon is composed (<see cref="ApplicationServices"/>); the use cases read these and never the raw options.
/// </summary>
public sealed class IndexSettings
{
    private IndexSettings(IndexKeeperOptions options)
    {
        Directory = options.IndexDirectory;
        var readers = ReaderSetup.Settings(options.Readers, options.IndexDirectory);
        Scan = new ScanSettings(
            options.Roots.Select(r => new RootSpec(r.Name, Path.GetFullPath(r.Path), r.Include, r.Exclude)).ToList(),
            new(
                options.Limits.MaxFileMegabytes * 1024 * 1024,
                options.Limits.MaxPages,
                options.Limits.MaxDecodedStreamMegabytes * 1024 * 1024,
                TimeSpan.FromSeconds(options.Limits.ReadTimeoutSeconds)),
            TimeSpan.FromSeconds(options.Detect.SettleSeconds),
            OfficeConverter: readers.OfficeConverter);
        RootPaths = Scan.Roots.ToDictionary(r => r.Name, r => r.Path, StringComparer.Ordinal);
        RootNames = options.Roots.Select(r => r.Name).ToList();
        Reader = new IsolatedReaderOptions
        {
            WorkerMemoryLimitBytes = options.Limits.WorkerMemoryMegabytes * 1024 * 1024,
            ReaderSettings = readers,
        };
        Segments = new SegmentWriterOptions
        {
            SealAtBytes = options.Storage.SealAtMegabytes * 1024 * 1024,
            SealAtAge = TimeSpan.FromHours(options.Storage.SealAtHours),
        };
        Compaction = new CompactionOptions
        {
            DeadShareThreshold = options.Storage.CompactDeadShare,
            SmallSegmentBytes = options.Storage.SmallSegmentMegabytes * 1024 * 1024,
            MinSmallSegmentsToMerge = options.Storage.MinSmallSegmentsToMerge,
            TargetSegmentBytes = options.Storage.SealAtMegabytes * 1024 * 1024,
        };
        Canaries = new CanarySettings(options.Drift.CanaryPages, options.Drift.CanaryMinimumMeanCosine, options.Drift.CanaryMinimumCosine);
        CanaryInterval = TimeSpan.FromHours(options.Drift.CanaryIntervalHours);
        Encoder = options.Encoder;
        MinimumTokenSimilarity = options.Query.MinimumTokenSimilarity;
        Candidates = options.Query.Candidates switch
        {
            "graph" => CandidateSource.Graph,
            "centroids" => CandidateSource.Centroids,
            _ => CandidateSource.All,
        };
        Retraining = new RetrainingPolicy(options.Query.RetrainBelowRecall, options.Query.RetrainAfterAddedShare);
        EncoderRecord = EncoderSettings.Record(options.Encoder);
        EmbedBatchSize = options.Encoder.BatchSize;
        Calendar = ScheduleSetup.Calendar(options.Schedule);
        BudgetPagesPerHour = options.Schedule.BudgetPagesPerHour;
    }

    /// <summary>The same settings with another encoder (<see cref="EncoderChoice"/>: the index's own).</summary>
    private IndexSettings(IndexSettings other, EncoderOptions encoder)
    {
        Directory = other.Directory;
        Scan = other.Scan;
        RootPaths = other.RootPaths;
        RootNames = other.RootNames;
        Reader = other.Reader;
        Segments = other.Segments;
        Compaction = other.Compaction;
        Canaries = other.Canaries;
        CanaryInterval = other.CanaryInterval;
        Encoder = encoder;
        EncoderRecord = EncoderSettings.Record(encoder);
        EmbedBatchSize = encoder.BatchSize;
        Calendar = other.Calendar;
        BudgetPagesPerHour = other.BudgetPagesPerHour;
        MinimumTokenSimilarity = other.MinimumTokenSimilarity;
        Candidates = other.Candidates;
        Retraining = other.Retraining;
    }

    /// <summary>The least best-match similarity one query vector must reach on a page for the page to be a hit.</summary>
    public double MinimumTokenSimilarity { get; }

    /// <summary>Where search candidates come from: every live page, the serving view's graph or its centroid lists.</summary>
    public CandidateSource Candidates { get; }

    /// <summary>When the serving view's centroids are retrained (<c>Query:Retrain*</c>).</summary>
    public RetrainingPolicy Retraining { get; }

    /// <summary>The index directory (catalog, segments, lock).</summary>
    public string Directory { get; }

    /// <summary>Roots, read limits and settle time of every scan.</summary>
    public ScanSettings Scan { get; }

    /// <summary>Each root's name and full path.</summary>
    public IReadOnlyDictionary<string, string> RootPaths { get; }

    /// <summary>The configured roots' names, in configuration order.</summary>
    public IReadOnlyList<string> RootNames { get; }

    public IsolatedReaderOptions Reader { get; }

    /// <summary>When the open segment is sealed.</summary>
    public SegmentWriterOptions Segments { get; }

    public CompactionOptions Compaction { get; }

    /// <summary>How canaries are sampled and judged; <see cref="CanarySettings.Pages"/> 0 turns them off.</summary>
    public CanarySettings Canaries { get; }

    /// <summary>How often the daemon checks the canaries.</summary>
    public TimeSpan CanaryInterval { get; }

    /// <summary>The active encoder's settings, from which it is built.</summary>
    public EncoderOptions Encoder { get; }

    /// <summary>The active encoder's settings as the catalog records them (a serving encoder is rebuilt from them).</summary>
    public IReadOnlyDictionary<string, string> EncoderRecord { get; }

    /// <summary>Pages per encoder call.</summary>
    public int EmbedBatchSize { get; }

    /// <summary>The windows in the configured time zone.</summary>
    public WindowCalendar Calendar { get; }

    /// <summary>Fresh pages per hour the gate allows outside windows.</summary>
    public long BudgetPagesPerHour { get; }

    public static IndexSettings From(IndexKeeperOptions options)
    {
        ArgumentNullException.ThrowIfNull(options);
        return new IndexSettings(options);
    }

    /// <summary>These settings with the encoder <see cref="EncoderChoice"/> picks for <paramref name="catalog"/>.</summary>
    public IndexSettings ForIndex(IndexCatalog catalog)
    {
        var encoder = EncoderChoice.Resolve(Encoder, catalog);
        return ReferenceEquals(encoder, Encoder) ? this : new IndexSettings(this, encoder);
    }
}
