using System.Diagnostics;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Documents.Isolation;

namespace IndexKeeper.Benchmarks;

/// <summary>
/// Pages per second of the readers by format, through the isolated reader worker as a scan reads (the
/// converters and Tesseract run as the worker's children): office and OpenDocument files by LibreOffice
/// conversion (OCR off, so conversion stands alone), text-like files by pagination, and scans by OCR
/// (with OCR off and with a warm OCR cache beside, so OCR's own cost shows). Each format with one reader,
/// as a scan reads today, and with two readers at once, what the machine's two cores can give.
/// </summary>
public sealed class ReaderBenchmark : IBenchmark
{
    // Generous: two conversions at once on a shared, loaded machine must not be cut off by the watchdog.
    private static readonly ReadLimits Limits = ReadLimits.Default with { ReadTimeout = TimeSpan.FromMinutes(5) };

    public string Name => "readers";

    public void Run(BenchmarkContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        var copies = context.Quick ? 2 : 6;
        var office = ReaderSamples.Office(Path.Combine(context.WorkDirectory, "office"), copies);
        var text = ReaderSamples.Text(Path.Combine(context.WorkDirectory, "text"), context.Quick ? 20 : 200);
        var scans = ReaderSamples.Scans(Path.Combine(context.WorkDirectory, "scans"), copies);
        context.Note($"{copies} documents per office and scan format, {text["txt"].Count} per text format; one reader reads them in turn, two readers split them");
        context.Note("office: an 8-page report, a 240-row workbook, a 12-slide deck (DocumentFormat.OpenXml) and LibreOffice's own saves of them as odt, rtf, doc, ods, xls, odp, ppt");
        context.Note($"scans: pages 5 onwards of {ReaderSamples.DebianManual} drawn at 300 dpi by pdftoppm; image-only PDFs of 2 pages, PNG and TIFF of 1 page");

        var conversion = ReaderSettings.Default with { Ocr = false };
        using (var readers = new ReaderPair(conversion))
        {
            // One warm-up for all office formats: a conversion dwarfs the JIT of each format's inspection,
            // and the PDF reader that reads every converted file is warmed here.
            readers.WarmUp(office["docx"][0]);
            foreach (var (format, paths) in office)
            {
                Measure(context, format + " (conversion)", readers, paths);
            }
        }

        using (var readers = new ReaderPair(ReaderSettings.Default))
        {
            foreach (var (format, paths) in text)
            {
                // Each format has its own parser (Markdig, AngleSharp, MimeKit) whose JIT would weigh on milliseconds.
                readers.WarmUp(paths[0]);
                Measure(context, format, readers, paths);
            }
        }

        var cache = Path.Combine(context.WorkDirectory, "ocr-cache");
        using var withOcr = new ReaderPair(ReaderSettings.Default);
        using var withoutOcr = Reader(ReaderSettings.Default with { Ocr = false });
        using var cached = Reader(ReaderSettings.Default with { OcrCacheDirectory = cache });
        foreach (var (format, paths) in scans)
        {
            // Per format: the PDF and TIFF readers' JIT in a cold worker would count as reading time.
            withOcr.WarmUp(paths[0]);
            withoutOcr.Read(paths[0], Limits, CancellationToken.None);
            var (pages, oneReader) = Measure(context, format + " (OCR)", withOcr, paths);
            var (_, unread) = Time([withoutOcr], paths);
            context.Report($"{format}: pages/s without OCR, one reader", pages / unread, "pages/s");
            context.Report($"{format}: OCR seconds per page, one reader", (oneReader - unread) / pages, "s");
            Time([cached], paths); // fills the cache
            var (_, hits) = Time([cached], paths);
            context.Report($"{format}: pages/s with every page in the OCR cache, one reader", pages / hits, "pages/s");
        }

        context.Note($"LibreOffice: {Version("soffice", "--version")}; Tesseract: {Version("tesseract", "--version")} (one thread per run, OMP_THREAD_LIMIT=1)");
    }

    /// <summary>Reports one format's figures; returns its page count and the one-reader seconds.</summary>
    private static (int Pages, double OneReader) Measure(BenchmarkContext context, string format, ReaderPair readers, List<string> paths)
    {
        var (pages, one) = Time([readers.First], paths);
        var (pagesAgain, two) = Time([readers.First, readers.Second], paths);
        if (pagesAgain != pages)
        {
            throw new InvalidOperationException($"{format}: {pages} pages read by one reader, {pagesAgain} by two");
        }

        context.Report($"{format}: pages per document", (double)pages / paths.Count, "pages");
        context.Report($"{format}: pages/s, one reader", pages / one, "pages/s");
        context.Report($"{format}: pages/s, two readers at once", pages / two, "pages/s");
        context.Report($"{format}: seconds per document, one reader", one / paths.Count, "s");
        return (pages, one);
    }

    /// <summary>Reads every path, the readers taking turns on their own threads; pages read and wall seconds.</summary>
    private static (int Pages, double Seconds) Time(IIsolatedDocumentReader[] readers, List<string> paths)
    {
        var pages = new int[readers.Length];
        var watch = Stopwatch.StartNew();
        Parallel.For(0, readers.Length, new ParallelOptions { MaxDegreeOfParallelism = readers.Length }, r =>
        {
            for (var i = r; i < paths.Count; i += readers.Length)
            {
                pages[r] += readers[r].Read(paths[i], Limits, CancellationToken.None).Pages.Count;
            }
        });
        watch.Stop();
        return (pages.Sum(), watch.Elapsed.TotalSeconds);
    }

    private static IIsolatedDocumentReader Reader(ReaderSettings settings) =>
        IsolatedReaderFactory.Create(new IsolatedReaderOptions { ReaderSettings = settings });

    private static string Version(string program, string argument)
    {
        var run = Core.Documents.Tools.ToolRunner.Run(program, [argument], TimeSpan.FromMinutes(1), null, 1 << 20, CancellationToken.None);
        return (run.OutputText + run.Error).Split('\n', StringSplitOptions.TrimEntries | StringSplitOptions.RemoveEmptyEntries).FirstOrDefault() ?? "unknown";
    }

    /// <summary>Two isolated readers with the same settings, each with its own worker process.</summary>
    private sealed class ReaderPair(ReaderSettings settings) : IDisposable
    {
        public IIsolatedDocumentReader First { get; } = Reader(settings);

        public IIsolatedDocumentReader Second { get; } = Reader(settings);

        /// <summary>Starts both workers and reads once untimed: JIT, the converter's libraries in the page cache.</summary>
        public void WarmUp(string path)
        {
            First.Read(path, Limits, CancellationToken.None);
            Second.Read(path, Limits, CancellationToken.None);
        }

        public void Dispose()
        {
            First.Dispose();
            Second.Dispose();
        }
    }
}
