using System.Globalization;
using System.Security.Cryptography;
using IndexKeeper.Core.Encoding.TextTokens;
using Microsoft.ML.OnnxRuntime;
using Microsoft.ML.Tokenizers;
using SkiaSharp;

namespace IndexKeeper.Core.Encoding.PageImages;

/// <summary>
/// Builds the page-image encoder (docs/encoders.md) on a user's exported late-interaction vision model:
/// a page graph and a query graph run by ONNX Runtime on the CPU, pages drawn by poppler's pdftoppm.
/// </summary>
public static class PageImageEncoderFactory
{
    public const string Name = "page-image";

    /// <summary>Version of the pipeline around the graphs (drawing, fitting, resampling, regions, normalising); raise it on any change that alters vectors. Never reuse a number.</summary>
    public const int SchemeVersion = 1;

    /// <summary>The only execution provider used: the tool must run with no GPU.</summary>
    public const string ExecutionProvider = "CPU";

    /// <exception cref="ArgumentException">One or more settings are bad; the message names each.</exception>
    /// <exception cref="InvalidOperationException">pdftoppm or a graph does not work as configured; the message starts with the setting's name.</exception>
    public static IPageEncoder Create(PageImageEncoderOptions options)
    {
        ArgumentNullException.ThrowIfNull(options);
        ThrowIfInvalid(options);
        IPdfRenderer renderer;
        try
        {
            renderer = PdftoppmRenderer.Create(options.Pdftoppm, TimeSpan.FromSeconds(options.RenderTimeoutSeconds));
        }
        catch (Exception e) when (e is InvalidOperationException or System.ComponentModel.Win32Exception or IOException)
        {
            throw new InvalidOperationException($"{nameof(options.Pdftoppm)}: '{options.Pdftoppm}' cannot be used to draw pages ({e.Message}).", e);
        }

        return Create(options, renderer);
    }

    /// <summary>Builds the encoder with the given renderer (tests use one that reports another version).</summary>
    internal static PageImageEncoder Create(PageImageEncoderOptions options, IPdfRenderer renderer)
    {
        ArgumentNullException.ThrowIfNull(options);
        ArgumentNullException.ThrowIfNull(renderer);
        ThrowIfInvalid(options);
        var pageModel = File.ReadAllBytes(options.PageModel);
        var queryModel = File.ReadAllBytes(options.QueryModel);
        var vocabulary = File.ReadAllBytes(options.QueryVocabulary);
        var identity = Identify(options, SHA256.HashData(pageModel), SHA256.HashData(queryModel), SHA256.HashData(vocabulary), renderer.Version, TextTokenEncoderFactory.RuntimeVersion());
        var tokenizer = CreateTokenizer(vocabulary, options.QueryLowerCase);
        using var sessionOptions = CpuSessionOptions.Create(options.IntraOpThreads);
        var pageSession = OpenSession(nameof(options.PageModel), pageModel, sessionOptions);
        InferenceSession? querySession = null;
        try
        {
            CheckNames(pageSession, nameof(options.PageModel), (nameof(options.PageInput), options.PageInput, true), (nameof(options.PageOutput), options.PageOutput, false));
            CheckWidth(pageSession, nameof(options.PageModel), options.PageOutput, options.Dimensions);
            querySession = OpenSession(nameof(options.QueryModel), queryModel, sessionOptions);
            CheckNames(querySession, nameof(options.QueryModel), (nameof(options.QueryInput), options.QueryInput, true), (nameof(options.QueryOutput), options.QueryOutput, false));
            if (options.QueryMaskInput.Length > 0)
            {
                CheckNames(querySession, nameof(options.QueryModel), (nameof(options.QueryMaskInput), options.QueryMaskInput, true));
            }

            CheckWidth(querySession, nameof(options.QueryModel), options.QueryOutput, options.Dimensions);
            return new PageImageEncoder(identity, options, renderer, pageSession, querySession, tokenizer);
        }
        catch
        {
            pageSession.Dispose();
            querySession?.Dispose();
            throw;
        }
    }

    /// <summary>The canonical description names every input of the vectors; the id is its SHA-256.</summary>
    internal static EncoderIdentity Identify(
        PageImageEncoderOptions options, byte[] pageModelHash, byte[] queryModelHash, byte[] vocabularyHash, string rendererVersion, string runtimeVersion)
    {
        ArgumentNullException.ThrowIfNull(options);
        var description = string.Create(
            CultureInfo.InvariantCulture,
            $"{Name};scheme={SchemeVersion};" +
            $"page-model-sha256={Convert.ToHexStringLower(pageModelHash)};page-input={options.PageInput};page-output={options.PageOutput};" +
            $"input={options.InputWidth}x{options.InputHeight};patch={options.PatchSize};fit={options.Fit};resample=area-average+white-paper;" +
            $"mean={Numbers(options.PixelMean)};std={Numbers(options.PixelStd)};" +
            $"renderer={rendererVersion};dpi={options.RenderDpi};box=crop;images=skiasharp-{AssemblyVersion(typeof(SKCodec))}+imagesharp-{AssemblyVersion(typeof(SixLabors.ImageSharp.Image))}+over-white;" +
            $"query-model-sha256={Convert.ToHexStringLower(queryModelHash)};query-input={options.QueryInput};query-mask={options.QueryMaskInput};query-output={options.QueryOutput};" +
            $"vocab-sha256={Convert.ToHexStringLower(vocabularyHash)};tokenizer=bert-wordpiece+basic+lowercase={options.QueryLowerCase}+cls-sep;query-max-tokens={options.QueryMaxTokens};" +
            $"rows=l2-normalised;pool={options.PoolFactor};dimensions={options.Dimensions};" +
            $"onnxruntime={runtimeVersion};provider={ExecutionProvider};graph-optimisation=all");
        var id = Convert.ToHexStringLower(SHA256.HashData(System.Text.Encoding.UTF8.GetBytes(description)));
        return new EncoderIdentity(id, Name, description, options.Dimensions);
    }

    private static void ThrowIfInvalid(PageImageEncoderOptions options)
    {
        var errors = options.Validate();
        if (errors.Count > 0)
        {
            throw new ArgumentException("Bad page-image encoder settings: " + string.Join(" ", errors), nameof(options));
        }
    }

    // Round-trip formatting: two different doubles never print alike.
    private static string Numbers(IReadOnlyList<double> values) => string.Join(",", values.Select(v => v.ToString("R", CultureInfo.InvariantCulture)));

    // The package version (informational version without build metadata): the assembly version of the
    // image library stays 2.0.0.0 across its 2.x releases, which may decode differently.
    private static string AssemblyVersion(Type type)
    {
        var informational = type.Assembly.GetCustomAttributes(typeof(System.Reflection.AssemblyInformationalVersionAttribute), inherit: false)
            .OfType<System.Reflection.AssemblyInformationalVersionAttribute>().FirstOrDefault()?.InformationalVersion;
        return informational?.Split('+')[0] ?? type.Assembly.GetName().Version?.ToString() ?? "unknown";
    }

    private static InferenceSession OpenSession(string setting, byte[] model, SessionOptions options)
    {
        try
        {
            return new InferenceSession(model, options);
        }
        catch (OnnxRuntimeException e)
        {
            throw new InvalidOperationException($"{setting}: the file is not an ONNX graph this runtime can run ({e.Message}).", e);
        }
    }

    private static void CheckNames(InferenceSession session, string graph, params (string Setting, string Name, bool Input)[] names)
    {
        foreach (var (setting, name, input) in names)
        {
            var known = input ? session.InputMetadata.Keys : session.OutputMetadata.Keys;
            if (!known.Contains(name))
            {
                throw new InvalidOperationException(
                    $"{setting}: the {graph} graph has no {(input ? "input" : "output")} '{name}'; it has {string.Join(", ", known.Select(k => $"'{k}'"))}.");
            }
        }
    }

    // A fixed last dimension must be d; a symbolic one is checked on every run.
    private static void CheckWidth(InferenceSession session, string graph, string output, int dimensions)
    {
        var shape = session.OutputMetadata[output].Dimensions;
        if (shape.Length is < 2 or > 3 || (shape[^1] > 0 && shape[^1] != dimensions))
        {
            throw new InvalidOperationException(
                $"{graph}: its output '{output}' has shape [{string.Join(", ", shape)}]; vectors [1, n, {dimensions}] or [n, {dimensions}] are needed (Encoder:Dimensions is {dimensions}).");
        }
    }

    private static BertTokenizer CreateTokenizer(byte[] vocabulary, bool lowerCase)
    {
        using var stream = new MemoryStream(vocabulary, writable: false);
        try
        {
            return BertTokenizer.Create(stream, new BertOptions
            {
                LowerCaseBeforeTokenization = lowerCase,
                ApplyBasicTokenization = true,
                RemoveNonSpacingMarks = lowerCase,
                IndividuallyTokenizeCjk = true,
                SplitOnSpecialTokens = false,
            });
        }
        catch (Exception e) when (e is ArgumentException or InvalidOperationException or FormatException)
        {
            throw new InvalidOperationException($"QueryVocabulary: the file is not a WordPiece vocabulary with [CLS], [SEP], [UNK] and [PAD] ({e.Message}).", e);
        }
    }
}
