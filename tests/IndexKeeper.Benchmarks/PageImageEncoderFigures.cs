using System.Diagnostics;
using System.Globalization;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Encoding.PageImages;
using IndexKeeper.Tests.Encoding.PageImages;

namespace IndexKeeper.Benchmarks;

/// <summary>
/// The page-image encoder's part of the <c>encoders</c> benchmark: A4 works reports of ~400 words drawn by
/// pdftoppm at 72 dpi, fitted into 448×448, run through graphs written by the benchmark (no model is
/// downloaded): the tests' patch graph (a 32×32 strided convolution to 128-d, ~0.15 GFLOP a page), a
/// stand-in (convolution to 768-d, then five 768×768 and one 768×128 matrix products with tanh between
/// them, ~2.1 GFLOP a page) and a large stand-in (1024-d, eleven 1024×1024 products, ~5.8 GFLOP a page) —
/// all far cheaper than a real late-interaction vision model, so the share of wall time outside the model
/// is an upper bound of what a real model would show.
/// </summary>
internal static class PageImageEncoderFigures
{
    private const int Input = 448;
    private const int Patch = 32;
    private const int Dimensions = 128;
    private const int StandInWidth = 768;
    private const int StandInLayers = 6;
    private const int LargeWidth = 1024;
    private const int LargeLayers = 12;

    public static void Run(BenchmarkContext context, int batchSize)
    {
        var documents = context.Quick ? 1 : 6;
        var pagesPerDocument = context.Quick ? 4 : 8;
        var folder = Path.Combine(context.WorkDirectory, "page-image");
        Directory.CreateDirectory(folder);
        var pages = new List<PageToEncode>();
        for (var d = 0; d < documents; d++)
        {
            var path = Path.Combine(folder, $"works-report-{d}.pdf");
            File.WriteAllBytes(path, GeneratedReport.Build(d, new int[pagesPerDocument], wordsPerPage: 400));
            for (var p = 1; p <= pagesPerDocument; p++)
            {
                pages.Add(new PageToEncode(PageKey.Of(System.Text.Encoding.UTF8.GetBytes($"{d}/{p}")), path, p, 595, 842, []));
            }
        }

        context.Note($"page-image: {pages.Count} A4 pages of 400 words in {documents} PDFs, 72 dpi, input {Input}×{Input}, patches {Patch}, batches of {batchSize}");
        var vocabulary = Path.Combine(folder, "vocab.txt");
        File.WriteAllLines(vocabulary, PageImageModels.Vocabulary);
        var query = Path.Combine(folder, "query.onnx");
        File.WriteAllBytes(query, OnnxModels.GatherGraph(PageImageModels.Sequence(PageImageModels.Vocabulary.Length * Dimensions, 3), Dimensions, "ids", "vectors"));

        var small = Path.Combine(folder, "patches.onnx");
        File.WriteAllBytes(small, OnnxModels.PatchGraph(Input, Input, Patch, Dimensions, PageImageModels.Sequence(Dimensions * 3 * Patch * Patch, 1), PageImageModels.Sequence(Dimensions, 2), "pixels", "vectors"));
        var standIn = Path.Combine(folder, "stand-in.onnx");
        File.WriteAllBytes(standIn, OnnxModels.PatchGraph(
            Input, Input, Patch, Dimensions, PageImageModels.Sequence(StandInWidth * 3 * Patch * Patch, 1), PageImageModels.Sequence(StandInWidth, 2), "pixels", "vectors", StandInLayers, StandInWidth));

        var large = Path.Combine(folder, "large-stand-in.onnx");
        File.WriteAllBytes(large, OnnxModels.PatchGraph(
            Input, Input, Patch, Dimensions, PageImageModels.Sequence(LargeWidth * 3 * Patch * Patch, 1), PageImageModels.Sequence(LargeWidth, 2), "pixels", "vectors", LargeLayers, LargeWidth));

        MeasureDrawing(context, pages);
        foreach (var (label, model) in new[] { ("patch graph", small), ("stand-in graph", standIn), ("large stand-in graph", large) })
        {
            foreach (var threads in new[] { 1, 2 })
            {
                var options = new PageImageEncoderOptions
                {
                    PageModel = model,
                    PageInput = "pixels",
                    PageOutput = "vectors",
                    InputWidth = Input,
                    InputHeight = Input,
                    PatchSize = Patch,
                    PixelMean = [0.5, 0.5, 0.5],
                    PixelStd = [0.5, 0.5, 0.5],
                    QueryModel = query,
                    QueryInput = "ids",
                    QueryOutput = "vectors",
                    QueryVocabulary = vocabulary,
                    Dimensions = Dimensions,
                    IntraOpThreads = threads,
                };
                using var encoder = (PageImageEncoder)PageImageEncoderFactory.Create(options);
                encoder.EncodePages(pages.Take(1).ToArray(), CancellationToken.None); // warm-up
                Measure(context, $"page-image {label} {threads} thread(s)", encoder, pages, batchSize);
            }
        }
    }

    /// <summary>What the encoder adds around the model, each part alone on one thread: drawing (pdftoppm, PPM read) and fitting.</summary>
    private static void MeasureDrawing(BenchmarkContext context, List<PageToEncode> pages)
    {
        var renderer = PdftoppmRenderer.Create("pdftoppm", TimeSpan.FromMinutes(5));
        var rasters = new List<RasterImage>();
        var (cpu, children) = (ProcessCpu(), ChildrenCpu());
        var started = Stopwatch.GetTimestamp();
        foreach (var document in pages.GroupBy(p => p.SourcePath))
        {
            renderer.Render(document.Key, 1, document.Count(), 72, (_, raster) => rasters.Add(raster), CancellationToken.None);
        }

        context.Report("page-image drawing ms/page", Stopwatch.GetElapsedTime(started).TotalMilliseconds / pages.Count, "ms");
        context.Report("page-image drawing CPU ms/page, pdftoppm", (ChildrenCpu() - children).TotalMilliseconds / pages.Count, "ms");
        context.Report("page-image drawing CPU ms/page, PPM read", (ProcessCpu() - cpu).TotalMilliseconds / pages.Count, "ms");
        var preprocessor = new PageImagePreprocessor(Input, Input, PageImageFit.Letterbox, [0.5, 0.5, 0.5], [0.5, 0.5, 0.5]);
        var input = new float[3 * Input * Input];
        for (var warmUp = 0; warmUp < 3; warmUp++)
        {
            // Past the runtime's first, unoptimised compilation of the loops.
            preprocessor.Fill(rasters[0], preprocessor.Place(rasters[0]), input);
        }

        cpu = ProcessCpu();
        started = Stopwatch.GetTimestamp();
        foreach (var raster in rasters)
        {
            preprocessor.Fill(raster, preprocessor.Place(raster), input);
        }

        context.Report("page-image fitting ms/page", Stopwatch.GetElapsedTime(started).TotalMilliseconds / pages.Count, "ms");
        context.Report("page-image fitting CPU ms/page", (ProcessCpu() - cpu).TotalMilliseconds / pages.Count, "ms");
    }

    private static void Measure(BenchmarkContext context, string label, PageImageEncoder encoder, List<PageToEncode> pages, int batchSize)
    {
        var modelBefore = encoder.ModelTime;
        var (cpuBefore, childrenBefore) = (ProcessCpu(), ChildrenCpu());
        var started = Stopwatch.GetTimestamp();
        for (var first = 0; first < pages.Count; first += batchSize)
        {
            encoder.EncodePages(pages.Skip(first).Take(batchSize).ToArray(), CancellationToken.None);
        }

        var wall = Stopwatch.GetElapsedTime(started);
        var cpu = ProcessCpu() - cpuBefore + (ChildrenCpu() - childrenBefore);
        var inModel = encoder.ModelTime - modelBefore;
        context.Report($"{label} pages/s", pages.Count / wall.TotalSeconds, "pages/s");
        context.Report($"{label} ms/page", wall.TotalMilliseconds / pages.Count, "ms");
        context.Report($"{label} model ms/page", inModel.TotalMilliseconds / pages.Count, "ms");
        context.Report($"{label} CPU ms/page (with pdftoppm)", cpu.TotalMilliseconds / pages.Count, "ms");
        context.Report($"{label} share outside the model", 100.0 * (1.0 - (inModel / wall)), "%");
    }

    private static TimeSpan ProcessCpu()
    {
        using var self = Process.GetCurrentProcess();
        return self.TotalProcessorTime;
    }

    /// <summary>CPU time of child processes that have ended (pdftoppm): fields 16 and 17 of /proc/self/stat, cutime and cstime in clock ticks (proc(5)); zero where there is none.</summary>
    private static TimeSpan ChildrenCpu()
    {
        try
        {
            var stat = File.ReadAllText("/proc/self/stat");
            var fields = stat[(stat.LastIndexOf(')') + 2)..].Split(' ');
            var ticks = long.Parse(fields[13], CultureInfo.InvariantCulture) + long.Parse(fields[14], CultureInfo.InvariantCulture);

            // USER_HZ is 100 on Linux for every architecture in use (proc(5), "clock ticks"; from memory).
            return TimeSpan.FromMilliseconds(ticks * 10);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException or FormatException)
        {
            return TimeSpan.Zero;
        }
    }
}
