using System.Diagnostics;
using System.Globalization;
using IndexKeeper.Churn.Report;
using IndexKeeper.Churn.Strategies;
using IndexKeeper.Demo;
using IndexKeeper.Service.Application;

namespace IndexKeeper.Churn;

/// <summary>
/// One large drive with the hashed-term encoder: text-only PDFs of 100 pages drawn by the demo's page
/// writer (about 60 words a page, so the run fits a small disk), a first sync, a rescan with no change,
/// and searches. Measures peak memory of this process (the reader worker is a separate process), the
/// catalog's size, the no-change scan time and search latency.
/// </summary>
internal sealed class ScaleRun(int pages, int seed, string workDirectory, Action<string> log)
{
    private const int PagesPerFile = 100;
    private const int Searches = 30;

    public ScaleReport Run()
    {
        var root = Path.Combine(workDirectory, "drive");
        var files = (pages + PagesPerFile - 1) / PagesPerFile;
        var stopwatch = Stopwatch.StartNew();
        Parallel.For(0, files, new ParallelOptions { MaxDegreeOfParallelism = Environment.ProcessorCount }, file =>
        {
            var folder = Path.Combine(root, "records", "batch-" + (file / 100).ToString("D3", CultureInfo.InvariantCulture));
            Directory.CreateDirectory(folder);
            File.WriteAllBytes(Path.Combine(folder, "record-" + file.ToString("D5", CultureInfo.InvariantCulture) + ".pdf"), Render(file, Math.Min(PagesPerFile, pages - file * PagesPerFile)));
        });
        var generateSeconds = stopwatch.Elapsed.TotalSeconds;
        log($"{files} files, {pages} pages generated in {generateSeconds:0} s");

        var keeper = new KeeperIndex(Path.Combine(workDirectory, "index"), root);
        var first = keeper.Sync(ChurnSimulation.Dimensions, compact: true);
        log($"first sync: {first.Summary.PagesEmbedded} pages embedded in {first.TotalSeconds:0} s (scan {first.ScanSeconds:0} s)");

        using var composed = keeper.Open(ChurnSimulation.Dimensions, "churn scale");
        stopwatch.Restart();
        var rescan = composed.Get<ScanOperation>().Walk("churn scale rescan", composed.Settings.Scan.Roots, CancellationToken.None);
        var rescanSeconds = stopwatch.Elapsed.TotalSeconds;
        log($"no-change scan: {rescan.DocumentsUnchanged} unchanged of {rescan.DocumentsSeen} in {rescanSeconds:0.0} s, {rescan.FilesHashed} hashed");

        var random = DemoRandom.For(seed, "scale-queries");
        var latencies = new List<double>();
        var search = composed.Get<SearchOperation>();
        for (var i = 0; i <= Searches; i++)
        {
            var text = new DemoText(random, (DemoTopic)random.Next(4), random.Pick(DemoVocabulary.Sites));
            var query = text.Equipment() + " " + text.Part();
            stopwatch.Restart();
            search.Search(query, 10, CancellationToken.None);
            if (i > 0)
            {
                // The first search maps the segments and warms the page cache; it is not counted.
                latencies.Add(stopwatch.Elapsed.TotalMilliseconds);
            }
        }

        latencies.Sort();
        var catalogBytes = new DirectoryInfo(keeper.IndexDirectory).EnumerateFiles("catalog*").Sum(f => f.Length);
        using var self = Process.GetCurrentProcess();
        return new ScaleReport(
            pages,
            files,
            generateSeconds,
            first.TotalSeconds,
            first.ScanSeconds,
            first.Summary.PagesEmbedded,
            rescanSeconds,
            rescan.FilesHashed,
            self.PeakWorkingSet64,
            catalogBytes,
            keeper.SegmentBytesOnDisk(),
            latencies[latencies.Count / 2],
            latencies[(int)Math.Ceiling(latencies.Count * 0.95) - 1],
            latencies.Count,
            $"{Environment.ProcessorCount} cores, {Environment.OSVersion}, .NET {Environment.Version}");
    }

    private byte[] Render(int file, int count)
    {
        var random = DemoRandom.For(seed, "scale/" + file.ToString(CultureInfo.InvariantCulture));
        var site = random.Pick(DemoVocabulary.Sites);
        var code = "HWA-REC-" + file.ToString("D5", CultureInfo.InvariantCulture);
        var composer = new PdfComposer("scale/" + code, new DemoPdfInfo(code + " Site records, " + site, "Records office", "Site records", "D:20260101090000Z", "D:20260101090000Z"));
        for (var page = 0; page < count; page++)
        {
            var writer = composer.AddPage(PaperSize.A4);
            var text = new DemoText(random.Fork(), (DemoTopic)random.Next(4), site);
            writer.Text(code + "  " + site + "  sheet " + (page + 1).ToString(CultureInfo.InvariantCulture), PageWriter.Margin, writer.Top, 10, writer.Fonts.Bold);
            new TextFlow(writer, writer.Top - 24).Paragraph(text.Paragraph(3));
        }

        return composer.Build();
    }
}
