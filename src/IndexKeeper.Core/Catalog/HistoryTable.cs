using LiteDB;

namespace IndexKeeper.Core.Catalog;

/// <summary>What passes and embed runs did: one record each, for status and the plan's measured throughput.</summary>
public sealed class HistoryTable
{
    /// <summary>The <see cref="ScanRecord.Command"/> of an embed record. Reaches the catalog: never change it.</summary>
    public const string EmbedCommand = "embed";

    private readonly ILiteCollection<ScanRecord> scans;

    internal HistoryTable(CatalogStore store) => scans = store.Scans;

    public void Add(ScanRecord scan) => scans.Insert(scan);

    /// <summary>Records what one embed run cost under one encoder, for the plan's throughput estimate.</summary>
    public void RecordEmbedding(string encoderId, DateTime startedUtc, double elapsedSeconds, long pagesEmbedded, long vectorsWritten, double encoderSeconds) =>
        scans.Insert(new ScanRecord
        {
            StartedUtc = startedUtc,
            ElapsedSeconds = elapsedSeconds,
            Command = EmbedCommand,
            EncoderId = encoderId,
            EncoderSeconds = encoderSeconds,
            Counts = new Dictionary<string, long> { ["pagesEmbedded"] = pagesEmbedded, ["vectorsWritten"] = vectorsWritten },
        });

    /// <summary>The latest embed records of one encoder, newest first.</summary>
    public IReadOnlyList<ScanRecord> Embeds(string encoderId, int count) =>
        scans.Query().Where(s => s.Command == EmbedCommand && s.EncoderId == encoderId).OrderByDescending(s => s.Id).Limit(count).ToList();

    /// <summary>
    /// Encoder seconds and vectors per page measured over the latest <paramref name="runs"/> embed records of one
    /// encoder (the plan's and the daemon's forecasts); null before the encoder embedded any page.
    /// </summary>
    public (double SecondsPerPage, double VectorsPerPage)? MeasuredThroughput(string encoderId, int runs)
    {
        var history = Embeds(encoderId, runs);
        var pages = history.Sum(h => h.Counts.GetValueOrDefault("pagesEmbedded"));
        return pages > 0 ? (history.Sum(h => h.EncoderSeconds) / pages, (double)history.Sum(h => h.Counts.GetValueOrDefault("vectorsWritten")) / pages) : null;
    }

    /// <summary>When the last scan pass (not an embed record) started.</summary>
    public DateTime? LastScanUtc() => LastScan()?.StartedUtc.ToUniversalTime();

    /// <summary>The last full scan pass (not an embed record); null before the first.</summary>
    public ScanRecord? LastScan() =>
        scans.Query().Where(s => s.Command != EmbedCommand).OrderByDescending(s => s.Id).Limit(1).FirstOrDefault();
}
