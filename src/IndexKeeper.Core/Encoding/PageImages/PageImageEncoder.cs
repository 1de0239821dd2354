using System.Collections.Concurrent;
using System.Diagnostics;
using IndexKeeper.Core.Documents;
using Microsoft.ML.OnnxRuntime;
using Microsoft.ML.Tokenizers;

namespace IndexKeeper.Core.Encoding.PageImages;

/// <summary>
/// The page-image encoder (docs/encoders.md): each page is drawn (PDF pages by one pdftoppm process per run
/// of consecutive pages of a document; image files decoded directly), turned as displayed, fitted and
/// normalised into the page graph's input, and run; each patch vector on the page is L2-normalised and
/// keeps the page region of its patch. Drawing runs on a second thread one page ahead of the model runs,
/// so on two cores it mostly hides behind them. Queries run through the query graph.
/// </summary>
internal sealed class PageImageEncoder : IPageEncoder, IDisposable
{
    // Pages drawn ahead of the model: enough to keep it busy, few enough to bound memory (each is 3·W·H floats).
    private const int PagesAhead = 2;

    private readonly PageImageEncoderOptions options;
    private readonly IPdfRenderer renderer;
    private readonly InferenceSession pageSession;
    private readonly InferenceSession querySession;
    private readonly BertTokenizer tokenizer;
    private readonly PageImagePreprocessor preprocessor;
    private readonly RunOptions runOptions = new();
    private long modelTicks;

    public PageImageEncoder(
        EncoderIdentity identity, PageImageEncoderOptions options, IPdfRenderer renderer, InferenceSession pageSession, InferenceSession querySession, BertTokenizer tokenizer)
    {
        Identity = identity;
        this.options = options;
        this.renderer = renderer;
        this.pageSession = pageSession;
        this.querySession = querySession;
        this.tokenizer = tokenizer;
        preprocessor = new PageImagePreprocessor(options.InputWidth, options.InputHeight, options.Fit, options.PixelMean, options.PixelStd);
    }

    public EncoderIdentity Identity { get; }

    /// <summary>Wall time spent inside page and query graph runs since creation (for the benchmark's share outside the model).</summary>
    internal TimeSpan ModelTime => Stopwatch.GetElapsedTime(0, Interlocked.Read(ref modelTicks));

    public IReadOnlyList<VectorSet> EncodePages(IReadOnlyList<PageToEncode> pages, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pages);
        var result = new VectorSet[pages.Count];
        using var stop = CancellationTokenSource.CreateLinkedTokenSource(cancellationToken);
        using var prepared = new BlockingCollection<PreparedPage>(PagesAhead);
        Exception? drawingFailure = null;
        var drawing = Task.Run(
            () =>
            {
                try
                {
                    Prepare(pages, page => prepared.Add(page, stop.Token), stop.Token);
                }
                catch (Exception e)
                {
                    drawingFailure = e;
                }
                finally
                {
                    prepared.CompleteAdding();
                }
            },
            CancellationToken.None);
        try
        {
            foreach (var page in prepared.GetConsumingEnumerable(stop.Token))
            {
                var set = Run(page);
                foreach (var index in page.Indices)
                {
                    result[index] = set;
                }
            }
        }
        finally
        {
            // Stop the drawing thread (and its pdftoppm) before leaving, whatever happened here.
            stop.Cancel();
            drawing.Wait(CancellationToken.None);
        }

        cancellationToken.ThrowIfCancellationRequested();
        if (drawingFailure is not null)
        {
            System.Runtime.ExceptionServices.ExceptionDispatchInfo.Throw(drawingFailure);
        }

        return result;
    }

    public VectorSet EncodeQuery(string text, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(text);
        cancellationToken.ThrowIfCancellationRequested();
        var ids = TokenIds(text);
        long[] shape = [1, ids.Count];
        var idsData = ids.Select(i => (long)i).ToArray();
        var names = new List<string> { options.QueryInput };
        using var idsValue = OrtValue.CreateTensorValueFromMemory(idsData, shape);
        var values = new List<OrtValue> { idsValue };
        using var maskValue = options.QueryMaskInput.Length > 0 ? OrtValue.CreateTensorValueFromMemory(Enumerable.Repeat(1L, ids.Count).ToArray(), shape) : null;
        if (maskValue is not null)
        {
            names.Add(options.QueryMaskInput);
            values.Add(maskValue);
        }

        var started = Stopwatch.GetTimestamp();
        using var outputs = querySession.Run(runOptions, names, values, [options.QueryOutput]);
        Interlocked.Add(ref modelTicks, Stopwatch.GetTimestamp() - started);
        var (rows, vectors) = Rows(outputs[0], nameof(options.QueryModel));
        if (rows != ids.Count)
        {
            throw new InvalidOperationException($"{nameof(options.QueryModel)}: the graph gives {rows} vectors for {ids.Count} tokens.");
        }

        Normalise(vectors, nameof(options.QueryModel));
        return new VectorSet(options.Dimensions, vectors, new PageBox[rows]);
    }

    /// <summary>The query's word-piece ids with [CLS] first and [SEP] last, cut to the configured length.</summary>
    internal IReadOnlyList<int> TokenIds(string text)
    {
        var ids = tokenizer.EncodeToIds(text, addSpecialTokens: true, considerPreTokenization: true, considerNormalization: true);
        if (ids.Count <= options.QueryMaxTokens)
        {
            return ids;
        }

        // Keep [SEP] at the end of a cut query, as the graph saw in training.
        return [.. ids.Take(options.QueryMaxTokens - 1), ids[^1]];
    }

    public void Dispose()
    {
        runOptions.Dispose();
        pageSession.Dispose();
        querySession.Dispose();
    }

    /// <summary>Draws and pre-processes every distinct (file, page) of the batch, in batch order of files.</summary>
    private void Prepare(IReadOnlyList<PageToEncode> pages, Action<PreparedPage> onPrepared, CancellationToken cancellationToken)
    {
        var byFile = new Dictionary<string, SortedDictionary<int, List<int>>>(StringComparer.Ordinal);
        var fileOrder = new List<string>();
        for (var i = 0; i < pages.Count; i++)
        {
            var page = pages[i];
            if (string.IsNullOrEmpty(page.SourcePath))
            {
                throw new InvalidOperationException($"page {page.Key.Hex} has no file to draw it from (its root is not configured).");
            }

            if (!byFile.TryGetValue(page.SourcePath, out var numbers))
            {
                numbers = [];
                byFile[page.SourcePath] = numbers;
                fileOrder.Add(page.SourcePath);
            }

            if (!numbers.TryGetValue(page.PageNumber, out var indices))
            {
                indices = [];
                numbers[page.PageNumber] = indices;
            }

            indices.Add(i);
        }

        foreach (var path in fileOrder)
        {
            var numbers = byFile[path];
            var kind = SignatureSniffer.Sniff(ReadFile(path, SignatureSniffer.PdfHeaderWindow));
            if (kind == DocumentKind.Pdf)
            {
                foreach (var (first, last) in Runs(numbers.Keys))
                {
                    renderer.Render(path, first, last, options.RenderDpi, (number, raster) => onPrepared(Preprocess(pages, numbers[number], raster)), cancellationToken);
                }
            }
            else
            {
                ImageFileDecoder.Decode(
                    ReadFile(path, int.MaxValue),
                    kind,
                    numbers.Keys,
                    (number, stored) => onPrepared(Preprocess(pages, numbers[number], stored.RotateClockwise(pages[numbers[number][0]].Rotation))),
                    cancellationToken);
            }
        }
    }

    /// <summary>
    /// Up to <paramref name="limit"/> bytes of a page's file. A file gone or unreadable since it was queued
    /// fails this batch (it stays queued) rather than the whole pass, which an I/O error would stop.
    /// </summary>
    private static byte[] ReadFile(string path, int limit)
    {
        try
        {
            using var stream = new FileStream(path, FileMode.Open, FileAccess.Read, FileShare.ReadWrite | FileShare.Delete);
            var bytes = new byte[Math.Min(limit, stream.Length)];
            stream.ReadExactly(bytes);
            return bytes;
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            throw new InvalidOperationException($"the page's file '{path}' cannot be read ({e.Message}).", e);
        }
    }

    /// <summary>Consecutive page numbers drawn by one process: the usual batch holds a whole new document.</summary>
    internal static IEnumerable<(int First, int Last)> Runs(IEnumerable<int> ascending)
    {
        int? first = null, last = null;
        foreach (var number in ascending)
        {
            if (last is { } previous && number == previous + 1)
            {
                last = number;
                continue;
            }

            if (first is not null)
            {
                yield return (first.Value, last!.Value);
            }

            first = last = number;
        }

        if (first is not null)
        {
            yield return (first.Value, last!.Value);
        }
    }

    private PreparedPage Preprocess(IReadOnlyList<PageToEncode> pages, List<int> indices, RasterImage raster)
    {
        var page = pages[indices[0]];
        var placement = preprocessor.Place(raster);
        var input = new float[3 * options.InputWidth * options.InputHeight];
        preprocessor.Fill(raster, placement, input);

        // A page of unknown size (0) is measured in raster pixels.
        var quarter = page.Rotation is 90 or 270;
        var width = page.Width > 0 ? page.Width : quarter ? raster.Height : raster.Width;
        var height = page.Height > 0 ? page.Height : quarter ? raster.Width : raster.Height;
        var regions = PatchGrid.Regions(options.InputWidth, options.InputHeight, options.PatchSize, placement, width, height, page.Rotation);
        return new PreparedPage(indices, input, regions);
    }

    private VectorSet Run(PreparedPage page)
    {
        using var input = OrtValue.CreateTensorValueFromMemory(page.Input, [1, 3, options.InputHeight, options.InputWidth]);
        var started = Stopwatch.GetTimestamp();
        using var outputs = pageSession.Run(runOptions, [options.PageInput], [input], [options.PageOutput]);
        Interlocked.Add(ref modelTicks, Stopwatch.GetTimestamp() - started);
        var (rows, all) = Rows(outputs[0], nameof(options.PageModel));
        var patches = (options.InputWidth / options.PatchSize) * (options.InputHeight / options.PatchSize);
        if (rows != patches)
        {
            throw new InvalidOperationException(
                $"{nameof(options.PageModel)}: the graph gives {rows} vectors, but an input of {options.InputWidth}×{options.InputHeight} in patches of {options.PatchSize} has {patches}.");
        }

        var d = options.Dimensions;
        var vectors = new float[page.Regions.Count * d];
        var regions = new PageBox[page.Regions.Count];
        for (var k = 0; k < page.Regions.Count; k++)
        {
            var (patch, region) = page.Regions[k];
            all.AsSpan(patch * d, d).CopyTo(vectors.AsSpan(k * d, d));
            regions[k] = region;
        }

        Normalise(vectors, nameof(options.PageModel));
        var set = new VectorSet(d, vectors, regions);
        return options.PoolFactor > 1 ? VectorPooling.Pool(set, options.PoolFactor) : set;
    }

    // Output [1, n, d] or [n, d] as n rows of d floats.
    private (int Rows, float[] Vectors) Rows(OrtValue output, string graph)
    {
        var shape = output.GetTensorTypeAndShape().Shape;
        var d = options.Dimensions;
        if (!(shape.Length == 2 || (shape.Length == 3 && shape[0] == 1)) || shape[^1] != d)
        {
            throw new InvalidOperationException($"{graph}: the graph gives a tensor of shape [{string.Join(", ", shape)}]; [1, n, {d}] or [n, {d}] is needed.");
        }

        return ((int)shape[^2], output.GetTensorDataAsSpan<float>().ToArray());
    }

    private void Normalise(float[] vectors, string graph)
    {
        var d = options.Dimensions;
        for (var row = 0; row < vectors.Length / d; row++)
        {
            var span = vectors.AsSpan(row * d, d);
            double squares = 0;
            foreach (var v in span)
            {
                squares += (double)v * v;
            }

            if (!(squares > 0) || double.IsInfinity(squares))
            {
                throw new InvalidOperationException($"{graph}: the graph gives a vector of length {Math.Sqrt(squares)}, which cannot be normalised.");
            }

            var scale = (float)(1.0 / Math.Sqrt(squares));
            for (var k = 0; k < d; k++)
            {
                span[k] *= scale;
            }
        }
    }

    private sealed record PreparedPage(List<int> Indices, float[] Input, List<(int Patch, PageBox Region)> Regions);
}
