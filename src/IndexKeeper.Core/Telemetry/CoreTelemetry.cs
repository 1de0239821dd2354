using System.Diagnostics;
using System.Diagnostics.Metrics;

namespace IndexKeeper.Core.Telemetry;

/// <summary>
/// The engine's traces and the measurements only the engine sees (encoder batches, scan passes). Both use
/// the BCL's listener-free APIs: with nobody listening (the one-shot commands) they cost next to nothing;
/// the daemon subscribes through OpenTelemetry. Names map to Prometheus names starting <c>indexkeeper_</c>.
/// </summary>
public static class CoreTelemetry
{
    public const string Name = "IndexKeeper";

    /// <summary>Bucket bounds in seconds, from a few milliseconds (a small page batch) to ten minutes (a full walk of a large tree).</summary>
    public static IReadOnlyList<double> SecondsBuckets { get; } = [0.005, 0.01, 0.025, 0.05, 0.1, 0.25, 0.5, 1, 2.5, 5, 10, 30, 60, 120, 300, 600];

    public static ActivitySource Traces { get; } = new(Name);

    private static readonly Meter Meter = new(Name);

    public static Counter<long> PagesEmbedded { get; } = Meter.CreateCounter<long>("indexkeeper.pages.embedded", "{page}", "Pages given vectors by the encoder.");

    public static Counter<long> PagesFailed { get; } = Meter.CreateCounter<long>("indexkeeper.pages.failed", "{page}", "Failed encoder attempts of pages.");

    public static Histogram<double> EncoderDuration { get; } = Meter.CreateHistogram(
        "indexkeeper.encoder.duration", "s", "Encoder time per page batch.", tags: null, new InstrumentAdvice<double> { HistogramBucketBoundaries = SecondsBuckets });

    public static Histogram<double> ScanDuration { get; } = Meter.CreateHistogram(
        "indexkeeper.scan.duration", "s", "Duration of scan passes (targeted and full walks).", tags: null, new InstrumentAdvice<double> { HistogramBucketBoundaries = SecondsBuckets });

    /// <summary>Reading one document into pages, per kind (pdf, officeopenxml, …, unreadable): conversion and OCR included, so a drive's reading cost shows beside its encoder cost.</summary>
    public static Histogram<double> DocumentReadDuration { get; } = Meter.CreateHistogram(
        "indexkeeper.document.read.duration", "s", "Time to read one document into pages (conversion and OCR included), by kind.", tags: null, new InstrumentAdvice<double> { HistogramBucketBoundaries = SecondsBuckets });

    public static Counter<long> CompactionBytes { get; } = Meter.CreateCounter<long>("indexkeeper.compaction.bytes", "By", "Segment bytes read, written and reclaimed by compaction.");

    public static Counter<long> CompactionWordBytes { get; } = Meter.CreateCounter<long>("indexkeeper.compaction.word_bytes", "By", "Page-word file bytes read, written and reclaimed by compaction.");
}
