namespace IndexKeeper.Service.Configuration;

/// <summary>
/// All settings, bound from (lowest to highest precedence) the JSON file given with <c>--config</c>,
/// environment variables prefixed <c>INDEXKEEPER_</c> (sections joined with <c>__</c>), and
/// command-line overrides <c>--Section:Key=value</c>. See config/indexkeeper.sample.json.
/// </summary>
public sealed class IndexKeeperOptions
{
    /// <summary>The index directory (catalog, segments, lock). Never inside a root.</summary>
    public string IndexDirectory { get; set; } = "indexkeeper-index";

    public List<RootOptions> Roots { get; set; } = [];

    public LimitsOptions Limits { get; set; } = new();

    public ReaderOptions Readers { get; set; } = new();

    public DetectOptions Detect { get; set; } = new();

    public EncoderOptions Encoder { get; set; } = new();

    public StorageOptions Storage { get; set; } = new();

    public DaemonOptions Daemon { get; set; } = new();

    public QueryOptions Query { get; set; } = new();

    public ScheduleOptions Schedule { get; set; } = new();

    public DriftOptions Drift { get; set; } = new();

    /// <summary>The shared work queue for embedding on other machines; unset, one process does everything.</summary>
    public QueueOptions Queue { get; set; } = new();
}
