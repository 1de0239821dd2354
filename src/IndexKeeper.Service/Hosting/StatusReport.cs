using IndexKeeper.Core.Search;

namespace IndexKeeper.Service.Hosting;

/// <summary>The figures of an index, as <c>status --json</c> prints them and the API serves them.</summary>
public sealed class StatusReport
{
    public string IndexDirectory { get; init; } = string.Empty;

    public long Documents { get; init; }

    /// <summary>Distinct page keys held by live documents.</summary>
    public long Pages { get; init; }

    /// <summary>Page positions in live documents (a page key held by two copies counts twice).</summary>
    public long PageLocations { get; init; }

    public long VectorSets { get; init; }

    /// <summary>Vector sets a live document holds (any encoder).</summary>
    public long LiveVectorSets { get; init; }

    public long Segments { get; init; }

    /// <summary>Share of segment bytes that no live vector set uses; compaction brings it down.</summary>
    public double DeadRatio { get; init; }

    /// <summary>The configured encoder's name and id.</summary>
    public string ActiveEncoder { get; init; } = string.Empty;

    public string ActiveEncoderId { get; init; } = string.Empty;

    /// <summary>The encoder searches rank with; differs from the active one while a migration runs.</summary>
    public string ServingEncoderId { get; init; } = string.Empty;

    /// <summary>Declared drift: pages whose live vectors are only under the serving encoder, waiting for migration.</summary>
    public long PagesDrifted { get; init; }

    /// <summary>Pages of the serving encoder that already have vectors of the active one.</summary>
    public long PagesMigrated { get; init; }

    /// <summary>Silent drift: the last canary check of the active encoder found its vectors changed (see <see cref="Canary"/>).</summary>
    public bool CanaryDrifted { get; init; }

    /// <summary>
    /// The last recall figure of the serving view's candidates (share of the exhaustive top-10 on sample queries,
    /// docs/search.md, "Recall"); null when never measured (candidates from every page are not measured).
    /// </summary>
    public CandidateRecall? CandidateRecall { get; init; }

    /// <summary>When the serving view's centroids were trained; null when not known (only a daemon holding the view knows it).</summary>
    public DateTimeOffset? CentroidsTrainedAt { get; init; }

    /// <summary>Share of the serving view's vectors added since its centroids were trained; null when not known (as above).</summary>
    public double? AddedShareSinceTraining { get; init; }

    /// <summary>The last canary check of the active encoder; null when never checked.</summary>
    public CanaryReport? Canary { get; init; }

    /// <summary>Segment files the catalog names that are not there (their vector sets are counted in <see cref="VectorSetsUnreadable"/>).</summary>
    public long SegmentsMissing { get; init; }

    /// <summary>Live vector sets whose bytes cannot be read: file missing, bad header, or a file shorter than the record (status does not read vectors; verify checks every checksum).</summary>
    public long VectorSetsUnreadable { get; init; }

    /// <summary>Pages a live document holds without a readable live vector set of the serving encoder, queued ones included.</summary>
    public long PagesWithoutVectors { get; init; }

    public long Queued { get; init; }

    public long Quarantined { get; init; }

    public long BytesOnDisk { get; init; }

    public DateTime? LastScanUtc { get; init; }

    public IReadOnlyList<string> Roots { get; init; } = [];

    public IReadOnlyList<QuarantineEntry> Quarantine { get; init; } = [];

    /// <summary>What the roots hold by type: indexed, quarantined, skipped by pattern, unsupported.</summary>
    public FileTally Files { get; init; } = new();

    /// <summary>The work queue and its workers, as the daemon last saw them (docs/work-queue.md); null without Queue:Connection or without the daemon.</summary>
    public WorkQueue.WorkQueueFigures? WorkQueue { get; set; }
}
