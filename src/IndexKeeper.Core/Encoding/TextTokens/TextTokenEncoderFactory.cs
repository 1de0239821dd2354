using System.Globalization;
using System.Security.Cryptography;
using Microsoft.ML.OnnxRuntime;
using Microsoft.ML.Tokenizers;

namespace IndexKeeper.Core.Encoding.TextTokens;

/// <summary>
/// Builds the text-token encoder (docs/encoders.md) on the pretrained 6-layer sentence encoder shipped in a
/// registry package, run by ONNX Runtime on the CPU.
/// </summary>
public static class TextTokenEncoderFactory
{
    public const string Name = "minilm";

    /// <summary>Version of the pipeline around the model (tokenising, windows, projection); raise it on any change that alters vectors. Never reuse a number.</summary>
    public const int SchemeVersion = 1;

    /// <summary>The only execution provider used: the tool must run with no GPU.</summary>
    public const string ExecutionProvider = "CPU";

    // Part of the encoder id: the tokenizer settings below, in words.
    private const string TokenizerDescription = "nfkd-unicode15-drop-combining+bert-wordpiece+basic+lowercase+strip-accents+cjk-split+no-special-split+max-word-chars-100";

    /// <exception cref="ArgumentException">One or more settings are bad; the message names each.</exception>
    /// <exception cref="InvalidOperationException">The model assembly is missing or lacks its resources.</exception>
    public static IPageEncoder Create(TextTokenEncoderOptions options) =>
        Create(options, ModelResources.ReadModel(), ModelResources.ReadVocabulary());

    /// <summary>Builds the encoder on the given model and vocabulary bytes (tests use a changed model).</summary>
    internal static TextTokenEncoder Create(TextTokenEncoderOptions options, byte[] model, byte[] vocabulary)
    {
        ArgumentNullException.ThrowIfNull(options);
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(vocabulary);
        var errors = options.Validate();
        if (errors.Count > 0)
        {
            throw new ArgumentException("Bad text-token encoder settings: " + string.Join(" ", errors), nameof(options));
        }

        var tokenizer = CreateTokenizer(vocabulary);
        var projection = SeededProjection.Create(options.Dimensions, TextTokenEncoderOptions.HiddenSize, options.ProjectionSeed);
        var identity = Identify(options, SHA256.HashData(model), SHA256.HashData(vocabulary), RuntimeVersion(), TokenizerVersion());
        using var sessionOptions = CpuSessionOptions.Create(options.IntraOpThreads);
        var session = new InferenceSession(model, sessionOptions);
        return new TextTokenEncoder(identity, session, tokenizer, projection, options);
    }

    /// <summary>The canonical description names every input of the vectors; the id is its SHA-256.</summary>
    internal static EncoderIdentity Identify(TextTokenEncoderOptions options, byte[] modelHash, byte[] vocabularyHash, string runtimeVersion, string tokenizerVersion)
    {
        var description = string.Create(
            CultureInfo.InvariantCulture,
            $"{Name};scheme={SchemeVersion};model-sha256={Convert.ToHexStringLower(modelHash)};vocab-sha256={Convert.ToHexStringLower(vocabularyHash)};" +
            $"tokenizer={TokenizerDescription};tokenizer-library={tokenizerVersion};max-sequence={options.MaxSequenceLength};window={options.MaxSequenceLength - 2};overlap={options.WindowOverlap};" +
            $"states={StatesDescription};projection=splitmix64-signs+gram-schmidt;seed={options.ProjectionSeed};dimensions={options.Dimensions};" +
            $"pool={options.PoolFactor};pooling={VectorPooling.Scheme};onnxruntime={runtimeVersion};provider={ExecutionProvider};graph-optimisation=all;" +
            $"stored={Storage.VectorQuantization.StoredForm}");
        var id = Convert.ToHexStringLower(SHA256.HashData(System.Text.Encoding.UTF8.GetBytes(description)));
        return new EncoderIdentity(id, Name, description, options.Dimensions);
    }

    /// <summary>
    /// The tokenizer library's version: its word-piece and normalisation code make the token ids, so an
    /// upgrade that changed them would change the vectors.
    /// </summary>
    internal static string TokenizerVersion() =>
        typeof(BertTokenizer).Assembly.GetCustomAttributes(typeof(System.Reflection.AssemblyInformationalVersionAttribute), false)
            .OfType<System.Reflection.AssemblyInformationalVersionAttribute>().FirstOrDefault()?.InformationalVersion
        ?? typeof(BertTokenizer).Assembly.GetName().Version?.ToString()
        ?? "unknown";

    /// <summary>The version of the native ONNX Runtime actually loaded.</summary>
    internal static string RuntimeVersion() => OrtEnv.Instance().GetVersionString();

    private const string StatesDescription = "last-hidden-state-fp32+most-central-window";

    private static BertTokenizer CreateTokenizer(byte[] vocabulary)
    {
        using var stream = new MemoryStream(vocabulary, writable: false);
        return BertTokenizer.Create(stream, new BertOptions
        {
            LowerCaseBeforeTokenization = true,
            ApplyBasicTokenization = true,
            RemoveNonSpacingMarks = true,
            IndividuallyTokenizeCjk = true,

            // A page that literally says "[SEP]" is text, not a control token.
            SplitOnSpecialTokens = false,
            MaxInputCharsPerWord = 100,
        });
    }
}
