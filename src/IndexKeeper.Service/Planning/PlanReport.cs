using IndexKeeper.Core.Queue;

namespace IndexKeeper.Service.Planning;

/// <summary>
/// What the next run would do, what it costs and when it would be done (docs/plan.md). The JSON of
/// <c>plan --json</c> and the daemon's <c>/api/plan</c>; field names are a contract.
/// </summary>
public sealed class PlanReport
{
    public string IndexDirectory { get; init; } = string.Empty;

    /// <summary>The instant the plan starts from, in the schedule's zone.</summary>
    public DateTimeOffset GeneratedAt { get; init; }

    public string TimeZone { get; init; } = string.Empty;

    public string ActiveEncoder { get; init; } = string.Empty;

    public string ActiveEncoderId { get; init; } = string.Empty;

    public DateTime? LastScanUtc { get; init; }

    public long DocumentsNew { get; init; }

    public long DocumentsChanged { get; init; }

    /// <summary>New paths holding bytes the index already has (copies, moves, renames): free.</summary>
    public long DocumentsCopied { get; init; }

    public long DocumentsDeleted { get; init; }

    public long DocumentsQuarantined { get; init; }

    public long DocumentsUnchanged { get; init; }

    /// <summary>Unchanged documents this build's readers read again (docs/readers.md, "Reader version"); their new pages are in <see cref="PagesToEmbed"/>.</summary>
    public long DocumentsReread { get; init; }

    /// <summary>Every page the encoder would embed: new pages of the scan, the queue, and drifted pages not yet queued.</summary>
    public long PagesToEmbed { get; init; }

    /// <summary>Pages of new, changed, copied and moved documents whose keys already have vectors: no encoder call.</summary>
    public long PagesFree { get; init; }

    /// <summary>Page keys no live document would hold any more; their vectors become dead.</summary>
    public long PagesToRemove { get; init; }

    /// <summary>Page keys the scan would add (pages never seen before).</summary>
    public long PagesNew { get; init; }

    /// <summary>Queued pages by priority, without those the scan would remove.</summary>
    public QueuedPages Queued { get; init; }

    /// <summary>Live pages whose only vectors are under another encoder than the active one.</summary>
    public long DriftedPages { get; init; }

    /// <summary>Drifted pages not yet queued: counted as migration work.</summary>
    public long DriftedNotQueued { get; init; }

    /// <summary>The work the finish time is simulated for, by priority.</summary>
    public QueuedPages Work { get; init; }

    public IReadOnlyList<string> RootsMissing { get; init; } = [];

    /// <summary>
    /// Seconds this plan spent reading new and changed documents (parsing, LibreOffice conversion, OCR), by
    /// kind: what the run's own read costs before any encoder call (OCR less: its results are cached by page).
    /// </summary>
    public IReadOnlyDictionary<string, double> ReadSecondsByKind { get; init; } = new Dictionary<string, double>();

    public double ReadSeconds { get; init; }

    /// <summary>Where the encoder cost comes from: <c>history</c>, <c>calibration</c> or <c>none</c>.</summary>
    public string ThroughputSource { get; init; } = "none";

    public double? EncoderSecondsPerPage { get; init; }

    /// <summary>Live workers of the active encoder (heartbeats); 0 without a work queue.</summary>
    public int LiveWorkers { get; init; }

    /// <summary>
    /// Their pages per second together: each worker's pages over its encoder seconds, a worker without a page
    /// yet at the mean of the others; null while no live worker has a measured rate.
    /// </summary>
    public double? WorkersPagesPerSecond { get; init; }

    public double? VectorsPerPage { get; init; }

    public double? EstimatedEncoderSeconds { get; init; }

    /// <summary>Bytes the new vector sets add to the segments (nothing is freed before compaction).</summary>
    public long? BytesDelta { get; init; }

    public bool CompactionDue { get; init; }

    public PlanCompaction Compaction { get; init; } = new();

    public bool WindowOpen { get; init; }

    /// <summary>When the window state next flips; null if never.</summary>
    public DateTimeOffset? NextWindowChange { get; init; }

    public long BudgetPagesPerHour { get; init; }

    /// <summary>When fresh work would be done (new and changed documents searchable).</summary>
    public DateTimeOffset? FreshFinish { get; init; }

    /// <summary>When all work would be done; null when unknown (no throughput) or never (no window for bulk work).</summary>
    public DateTimeOffset? EstimatedFinish { get; init; }

    public IReadOnlyList<PlanBreakdownRow> Breakdown { get; init; } = [];

    /// <summary>Retraining of the serving view's centroids: due or not, why, its cost and when; null unless <c>Query:Candidates</c> is <c>centroids</c>.</summary>
    public PlanRetraining? Retraining { get; init; }

    /// <summary>What limits the figures (unknown throughput, pages not attributed, walk problems).</summary>
    public IReadOnlyList<string> Notes { get; init; } = [];

    public double ElapsedSeconds { get; init; }
}
