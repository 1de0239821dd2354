using System.Globalization;
using IndexKeeper.Core.Compaction;
using IndexKeeper.Core.Index;
using IndexKeeper.Core.Pipeline;
using IndexKeeper.Core.Storage;
using IndexKeeper.Service.Application;
using IndexKeeper.Service.Configuration;

namespace IndexKeeper.Benchmarks;

/// <summary>
/// Steady churn through the whole job: a store of multi-page PDFs whose pages carry about 1,030 words (so
/// about 1,030 hashed-term vectors of 128-d each), then rounds in which a tenth of all pages is edited
/// and saved, each round followed by a sync (the real session, reader worker, scan pass, embed pass and
/// vector store) and a compaction as the <c>compact</c> command runs it (seal the open segment, then the
/// policy). Reports space amplification (segment bytes on disk / live record bytes) and write
/// amplification (segment bytes written, compaction included / segment bytes written by embedding).
/// </summary>
public sealed class ChurnBenchmark : IBenchmark
{
    private const int Rounds = 10;
    private const double EditShare = 0.10;
    private const int PagesPerDocument = 4;

    /// <summary>About 1,030 vectors a page with the header, footer and title words of a page.</summary>
    private const int WordsPerPage = 1_017;

    public string Name => "churn";

    public void Run(BenchmarkContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        var documents = context.Quick ? 3 : 150;
        var rounds = context.Quick ? 2 : Rounds;
        var root = Path.Combine(context.WorkDirectory, "store");
        Directory.CreateDirectory(root);
        var revisions = Enumerable.Range(0, documents).Select(_ => new int[PagesPerDocument]).ToArray();
        var (generated, _) = Measure.Once(() => Parallel.For(0, documents, d => Write(root, d, revisions[d])));
        context.Note($"{documents} documents of {PagesPerDocument} pages of {WordsPerPage} generated words, written in {generated:0.0} s");

        var options = OptionsLoader.Load(new ConfigurationSources(
            null, Path.Combine(context.WorkDirectory, "index"), [], ["Detect:SettleSeconds=0", "Encoder:Name=hashed-terms", "Roots:0:Name=store", $"Roots:0:Path={root}"]));
        using var composed = IndexComposition.Open(options, "benchmark churn");
        var session = composed.Index;
        var store = session.Store;
        var compaction = composed.Settings.Compaction;
        context.Note(string.Create(CultureInfo.InvariantCulture,
            $"shipped storage settings: seal at {options.Storage.SealAtMegabytes} MiB, compact at {compaction.DeadShareThreshold:P0} dead, small segments under {options.Storage.SmallSegmentMegabytes} MiB"));

        var first = Sync(composed);
        long ingested = first.Ingested, rewritten = 0;
        var pages = documents * PagesPerDocument;
        context.Report("pages", pages, "pages");
        context.Report("vectors per page, mean", first.Summary.VectorsWritten / (double)first.Summary.PagesEmbedded, "vectors");
        context.Report("live bytes after the first sync", Live(session) / 1e6, "MB");
        context.Report("first sync", first.Seconds, "s");

        var random = new Random(7717);
        var worst = 0.0;
        for (var round = 1; round <= rounds; round++)
        {
            var edited = random.GetItems(Enumerable.Range(0, pages).ToArray(), pages).Distinct().Take(Math.Max(1, (int)(pages * EditShare))).ToList();
            foreach (var page in edited)
            {
                revisions[page / PagesPerDocument][page % PagesPerDocument] = round;
            }

            foreach (var document in edited.Select(p => p / PagesPerDocument).Distinct())
            {
                Write(root, document, revisions[document]);
            }

            var sync = Sync(composed);
            if (sync.Summary.PagesEmbedded != edited.Count)
            {
                throw new InvalidOperationException($"round {round}: {edited.Count} pages edited, {sync.Summary.PagesEmbedded} embedded");
            }

            var beforeCompaction = OnDisk(store) / (double)Live(session);
            CompactionReport report = null!;
            var (compacted, _) = Measure.Once(() => report = composed.Get<CompactOperation>().Run(CancellationToken.None));
            ingested += sync.Ingested;
            rewritten += report.BytesWritten;
            var space = OnDisk(store) / (double)Live(session);
            worst = Math.Max(worst, space);
            var label = $"round {round,2}";
            context.Report($"{label}: space amplification before compaction", beforeCompaction, "x");
            context.Report($"{label}: space amplification after compaction", space, "x");
            context.Report($"{label}: segments after compaction", session.Catalog.Segments.All().Count, "segments");
            context.Report($"{label}: bytes written by compaction", report.BytesWritten / 1e6, "MB");
            context.Report($"{label}: sync time", sync.Seconds, "s");
            context.Report($"{label}: compaction time (seal + policy + rewrite)", compacted, "s");
            context.Note(string.Create(CultureInfo.InvariantCulture,
                $"{label}: {edited.Count} pages edited in {edited.Select(p => p / PagesPerDocument).Distinct().Count()} documents; {sync.Ingested / 1e6:0.0} MB embedded; compaction: {report.Jobs} jobs, {report.SegmentsRewritten} segments rewritten"));
        }

        var steadyIngest = ingested - first.Ingested;
        context.Report("end: space amplification", OnDisk(store) / (double)Live(session), "x");
        context.Report("worst space amplification after a compaction", worst, "x");
        context.Report("end: live bytes", Live(session) / 1e6, "MB");
        context.Report("end: segment bytes on disk", OnDisk(store) / 1e6, "MB");
        context.Report("write amplification, whole run (first sync included)", (ingested + rewritten) / (double)ingested, "x");
        context.Report("write amplification, churn rounds only", (steadyIngest + rewritten) / (double)steadyIngest, "x");
        context.Report("bytes embedded in all", ingested / 1e6, "MB");
        context.Report("bytes rewritten by compaction", rewritten / 1e6, "MB");
        context.Note("goal: space amplification <= 1.3 under steady churn");
    }

    private static void Write(string root, int document, int[] revisions) =>
        File.WriteAllBytes(Path.Combine(root, $"works-report-{document:D4}.pdf"), GeneratedReport.Build(document, revisions, WordsPerPage));

    /// <summary>One sync (the <c>sync</c> command's use case); Ingested = segment bytes it appended.</summary>
    private static (ScanSummary Summary, long Ingested, double Seconds) Sync(IndexComposition composed)
    {
        var session = composed.Index;
        var before = session.Catalog.Segments.All().Sum(s => s.Length);
        ScanSummary summary = null!;
        var (seconds, _) = Measure.Once(() => summary = composed.Get<SyncOperation>().Run("benchmark churn", null, CancellationToken.None));
        if (summary.PagesFailed != 0 || summary.DocumentsQuarantined != 0 || summary.DocumentsDeferred != 0)
        {
            throw new InvalidOperationException($"sync: {summary.PagesFailed} pages failed, {summary.DocumentsQuarantined} quarantined, {summary.DocumentsDeferred} deferred");
        }

        return (summary, session.Catalog.Segments.All().Sum(s => s.Length) - before, seconds);
    }

    private static long Live(OpenIndex session) =>
        session.Catalog.VectorSets.Live(session.Encoder.Identity.Id).Sum(v => (long)v.Length);

    private static long OnDisk(VectorStore store) =>
        new DirectoryInfo(store.Directory).EnumerateFiles(SegmentFileNames.SearchPattern).Sum(f => f.Length);
}
