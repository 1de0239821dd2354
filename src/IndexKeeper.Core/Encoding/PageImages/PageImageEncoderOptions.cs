using IndexKeeper.Core.Documents.Tools;

namespace IndexKeeper.Core.Encoding.PageImages;

/// <summary>
/// Settings of the page-image encoder (docs/encoders.md): an exported late-interaction vision model (page
/// graph), its query graph and WordPiece vocabulary, and how pages become the page graph's input. All but
/// <see cref="IntraOpThreads"/> and <see cref="RenderTimeoutSeconds"/> change the vectors and so are part of
/// the encoder id. <see cref="Validate"/> reports every bad setting at once, each by its name.
/// </summary>
public sealed class PageImageEncoderOptions
{
    /// <summary>The page graph (ONNX file): pixels [1, 3, height, width] in, patch vectors [1, n, d] or [n, d] out.</summary>
    public string PageModel { get; set; } = string.Empty;

    public string PageInput { get; set; } = "pixel_values";

    public string PageOutput { get; set; } = "embeddings";

    /// <summary>Width of the page graph's input in pixels; a multiple of <see cref="PatchSize"/>.</summary>
    public int InputWidth { get; set; } = 448;

    public int InputHeight { get; set; } = 448;

    /// <summary>Input pixels per patch side: the page graph's output rows are the patch grid in row-major order.</summary>
    public int PatchSize { get; set; } = 32;

    /// <summary>How a page is fitted into the input: <c>letterbox</c> (keep proportions, pad with white) or <c>stretch</c>.</summary>
    public string Fit { get; set; } = PageImageFit.Letterbox;

    /// <summary>Per-channel mean (R, G, B) subtracted from pixel values scaled to 0..1; the model's export names it (no default).</summary>
    public IReadOnlyList<double> PixelMean { get; set; } = [];

    /// <summary>Per-channel standard deviation (R, G, B) the centred values are divided by (no default).</summary>
    public IReadOnlyList<double> PixelStd { get; set; } = [];

    /// <summary>Resolution PDF pages are rendered at (dots per inch) before being fitted into the input.</summary>
    public int RenderDpi { get; set; } = 72;

    /// <summary>The query graph (ONNX file): token ids [1, m] (int64) in, token vectors [1, m, d] or [m, d] out.</summary>
    public string QueryModel { get; set; } = string.Empty;

    public string QueryInput { get; set; } = "input_ids";

    /// <summary>Name of the query graph's attention-mask input (all ones), or empty when it has none.</summary>
    public string QueryMaskInput { get; set; } = string.Empty;

    public string QueryOutput { get; set; } = "embeddings";

    /// <summary>The query tokenizer's WordPiece vocabulary (one token a line, the line number is the id).</summary>
    public string QueryVocabulary { get; set; } = string.Empty;

    /// <summary>Lower-case and strip accents before WordPiece (an uncased vocabulary).</summary>
    public bool QueryLowerCase { get; set; } = true;

    /// <summary>Word-piece tokens of a query kept, [CLS] and [SEP] included; the rest is cut off.</summary>
    public int QueryMaxTokens { get; set; } = 64;

    /// <summary>Poppler's <c>pdftoppm</c>: a path, or a bare name looked up on PATH.</summary>
    public string Pdftoppm { get; set; } = "pdftoppm";

    /// <summary>A document whose rendering takes longer is abandoned (its pages fail and stay queued).</summary>
    public double RenderTimeoutSeconds { get; set; } = 120;

    /// <summary>Output size d the models must give; a multiple of 64.</summary>
    public int Dimensions { get; set; } = 128;

    /// <summary>Page vectors per pooled vector (1 = no pooling).</summary>
    public int PoolFactor { get; set; } = 1;

    /// <summary>Threads inside one model run; 0 lets the runtime choose. Does not change the vectors.</summary>
    public int IntraOpThreads { get; set; } = 1;

    /// <summary>Every bad setting, each message starting with the setting's name.</summary>
    public IReadOnlyList<string> Validate()
    {
        var errors = new List<string>();
        RequireFile(errors, nameof(PageModel), PageModel);
        RequireFile(errors, nameof(QueryModel), QueryModel);
        RequireFile(errors, nameof(QueryVocabulary), QueryVocabulary);
        RequireName(errors, nameof(PageInput), PageInput);
        RequireName(errors, nameof(PageOutput), PageOutput);
        RequireName(errors, nameof(QueryInput), QueryInput);
        RequireName(errors, nameof(QueryOutput), QueryOutput);
        if (PatchSize is < 1 or > 1024)
        {
            errors.Add($"{nameof(PatchSize)}: {PatchSize} is out of range; allowed 1 to 1024.");
        }
        else
        {
            CheckSide(errors, nameof(InputWidth), InputWidth);
            CheckSide(errors, nameof(InputHeight), InputHeight);
        }

        if (QueryMaxTokens is < 3 or > 4096)
        {
            errors.Add($"{nameof(QueryMaxTokens)}: {QueryMaxTokens} is out of range; allowed 3 to 4096.");
        }

        if (Fit is not (PageImageFit.Letterbox or PageImageFit.Stretch))
        {
            errors.Add($"{nameof(Fit)}: '{Fit}' is not a fit; use {PageImageFit.Letterbox} or {PageImageFit.Stretch}.");
        }

        CheckChannels(errors, nameof(PixelMean), PixelMean, mustBePositive: false);
        CheckChannels(errors, nameof(PixelStd), PixelStd, mustBePositive: true);
        if (RenderDpi is < 18 or > 1200)
        {
            errors.Add($"{nameof(RenderDpi)}: {RenderDpi} is out of range; allowed 18 to 1200.");
        }

        if (string.IsNullOrWhiteSpace(Pdftoppm))
        {
            errors.Add($"{nameof(Pdftoppm)}: must name poppler's pdftoppm (a path, or a name on PATH).");
        }
        else if (ExecutableLocator.Find(Pdftoppm) is null)
        {
            errors.Add($"{nameof(Pdftoppm)}: '{Pdftoppm}' is not found{(Path.IsPathFullyQualified(Pdftoppm) ? string.Empty : " on PATH")}; install poppler-utils (./install does) or give its path.");
        }

        if (double.IsNaN(RenderTimeoutSeconds) || RenderTimeoutSeconds is < 1 or > 3600)
        {
            errors.Add($"{nameof(RenderTimeoutSeconds)}: {RenderTimeoutSeconds} is out of range; allowed 1 to 3600.");
        }

        if (Dimensions is < 64 or > 4096 || Dimensions % 64 != 0)
        {
            errors.Add($"{nameof(Dimensions)}: {Dimensions} is not allowed; use a multiple of 64 from 64 to 4096.");
        }

        if (PoolFactor is < 1 or > 64)
        {
            errors.Add($"{nameof(PoolFactor)}: {PoolFactor} is out of range; allowed 1 (off) to 64.");
        }

        if (IntraOpThreads is < 0 or > 256)
        {
            errors.Add($"{nameof(IntraOpThreads)}: {IntraOpThreads} is out of range; allowed 0 (runtime's choice) to 256.");
        }

        return errors;
    }

    private static void RequireFile(List<string> errors, string name, string path)
    {
        if (string.IsNullOrWhiteSpace(path))
        {
            errors.Add($"{name}: must name a file.");
        }
        else if (!File.Exists(path))
        {
            errors.Add($"{name}: the file '{path}' does not exist.");
        }
    }

    private static void RequireName(List<string> errors, string name, string value)
    {
        if (string.IsNullOrWhiteSpace(value))
        {
            errors.Add($"{name}: must name a tensor of the graph.");
        }
    }

    private void CheckSide(List<string> errors, string name, int value)
    {
        if (value < PatchSize || value > 8192 || value % PatchSize != 0)
        {
            errors.Add($"{name}: {value} is not allowed; use a multiple of {nameof(PatchSize)} ({PatchSize}) up to 8192.");
        }
    }

    private static void CheckChannels(List<string> errors, string name, IReadOnlyList<double>? values, bool mustBePositive)
    {
        if (values is null || values.Count != 3)
        {
            errors.Add($"{name}: give 3 values (R, G, B), got {values?.Count ?? 0}.");
        }
        else if (values.Any(v => !double.IsFinite(v) || (mustBePositive ? v <= 0 : Math.Abs(v) > 1000)))
        {
            errors.Add($"{name}: [{string.Join(", ", values)}] is not allowed; each value must be finite{(mustBePositive ? " and above 0" : string.Empty)}.");
        }
    }
}
