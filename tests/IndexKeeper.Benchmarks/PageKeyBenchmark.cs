using System.Diagnostics;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Documents.Pdf;
using UglyToad.PdfPig;
using UglyToad.PdfPig.Content;
using UglyToad.PdfPig.Core;
using UglyToad.PdfPig.Fonts.Standard14Fonts;
using UglyToad.PdfPig.Writer;

namespace IndexKeeper.Benchmarks;

/// <summary>
/// Read + page-key throughput on generated multi-page PDFs (text, rules, boxes and an image every few
/// pages, in our invented water-utility scenario): whole-document reads through the real reader for
/// pages per second, and the same steps timed per page for the median and 95th percentile.
/// </summary>
public sealed class PageKeyBenchmark : IBenchmark
{
    public string Name => "pagekeys";

    public void Run(BenchmarkContext context)
    {
        var documents = context.Quick ? 2 : 20;
        var pagesPerDocument = context.Quick ? 8 : 50;
        var paths = new List<string>();
        for (var d = 0; d < documents; d++)
        {
            var path = Path.Combine(context.WorkDirectory, $"harrowmere-report-{d:D3}.pdf");
            File.WriteAllBytes(path, Generate(d, pagesPerDocument));
            paths.Add(path);
        }

        context.Note($"{documents} generated documents of {pagesPerDocument} pages, {paths.Sum(p => new FileInfo(p).Length) / 1024} KiB in all");
        var reader = DocumentReaderFactory.Create();
        reader.Read(paths[0], ReadLimits.Default, CancellationToken.None); // warm-up: JIT and font tables

        var total = Stopwatch.StartNew();
        var pages = 0;
        foreach (var path in paths)
        {
            pages += reader.Read(path, ReadLimits.Default, CancellationToken.None).Pages.Count;
        }

        total.Stop();
        context.Report("read pages per second (key + words)", pages / total.Elapsed.TotalSeconds, "pages/s");
        context.Report("read ms per page, mean over documents", total.Elapsed.TotalMilliseconds / pages, "ms");

        var keyTimes = new List<double>();
        var pageTimes = new List<double>();
        foreach (var path in paths)
        {
            TimePages(File.ReadAllBytes(path), keyTimes, pageTimes);
        }

        context.Report("page key ms per page, median", Percentile(keyTimes, 0.5), "ms");
        context.Report("page key ms per page, p95", Percentile(keyTimes, 0.95), "ms");
        context.Report("page read ms per page (key + parse + words), median", Percentile(pageTimes, 0.5), "ms");
        context.Report("page read ms per page (key + parse + words), p95", Percentile(pageTimes, 0.95), "ms");
        context.Report("page keys per second (key only)", keyTimes.Count / (keyTimes.Sum() / 1000), "pages/s");
    }

    /// <summary>The reader's per-page steps, timed one page at a time.</summary>
    private static void TimePages(byte[] file, List<double> keyTimes, List<double> pageTimes)
    {
        using var document = PdfDocument.Open(file, new ParsingOptions { UseLenientParsing = true, SkipMissingFonts = true });
        var resolver = new PdfObjectResolver(document.Structure);
        var nodes = PdfPageTree.Collect(resolver, document.Structure.Catalog.CatalogDictionary, ReadLimits.Default.MaxPages, CancellationToken.None);
        var canonicalizer = new PdfPageCanonicalizer(resolver, ReadLimits.Default.MaxDecodedBytesPerStream, CancellationToken.None);
        for (var i = 0; i < nodes.Count; i++)
        {
            var watch = Stopwatch.StartNew();
            PageKey.Of(canonicalizer.Canonicalize(nodes[i]));
            var keyed = watch.Elapsed.TotalMilliseconds;
            var words = PdfWordExtractor.Extract(document.GetPage(i + 1), canonicalizer.VisibleBox(nodes[i]));
            watch.Stop();
            GC.KeepAlive(words);
            keyTimes.Add(keyed);
            pageTimes.Add(watch.Elapsed.TotalMilliseconds);
        }
    }

    private static double Percentile(List<double> values, double fraction)
    {
        var sorted = values.Order().ToList();
        return sorted[Math.Min(sorted.Count - 1, (int)Math.Ceiling(fraction * sorted.Count) - 1)];
    }

    private static byte[] Generate(int seed, int pages)
    {
        using var builder = new PdfDocumentBuilder();
        var font = builder.AddStandard14Font(Standard14Font.Helvetica);
        var bold = builder.AddStandard14Font(Standard14Font.HelveticaBold);
        var image = GreyPng(32, 32, (byte)seed);
        for (var p = 1; p <= pages; p++)
        {
            var page = builder.AddPage(PageSize.A4);
            page.AddText($"Harrowmere Water Authority — works report {seed}, page {p}", 14, new PdfPoint(56, 790), bold);
            for (var line = 0; line < 40; line++)
            {
                page.AddText(
                    $"Station {seed}-{p}-{line}: inflow {(seed * 31 + p * 17 + line * 7) % 900} m3/h, turbidity 0.{line % 10} NTU, chlorine {line % 4}.{p % 10} mg/l",
                    9,
                    new PdfPoint(56, 760 - (line * 16)),
                    font);
            }

            page.DrawRectangle(new PdfPoint(50, 110), 495, 670, 0.5);
            for (var rule = 0; rule < 10; rule++)
            {
                page.DrawLine(new PdfPoint(50, 120 + (rule * 64)), new PdfPoint(545, 120 + (rule * 64)), 0.3);
            }

            if (p % 5 == 0)
            {
                page.AddPng(image, new PdfRectangle(400, 40, 540, 100));
            }
        }

        return builder.Build();
    }

    private static byte[] GreyPng(int width, int height, byte shade)
    {
        using var image = new SixLabors.ImageSharp.Image<SixLabors.ImageSharp.PixelFormats.L8>(width, height);
        for (var y = 0; y < height; y++)
        {
            for (var x = 0; x < width; x++)
            {
                image[x, y] = new SixLabors.ImageSharp.PixelFormats.L8((byte)(shade + (x * 4) + (y * 2)));
            }
        }

        var png = new MemoryStream();
        SixLabors.ImageSharp.ImageExtensions.SaveAsPng(image, png);
        return png.ToArray();
    }
}
