using IndexKeeper.Core.Documents.Tools;

namespace IndexKeeper.Core.Encoding.PageImages;

/// <summary>
/// Settings of the page-image encoder (docs/encoders.md): an exported late-interaction vision model (page
/// graph), its query graph and WordPiece vocabulary, and how pages become the page graph's input. All but
/// <see cref="IntraOpThreads"/> and <see cref="RenderTimeoutSeconds"/> change the vectors and so are part of
/// the encoder id. <see cref="Validate"/> reports every bad setting at once, each by its name. The model's own
/// settings are <see cref="PageImageModelOptions"/> (the configuration section binds to that type); d, pooling
/// and threads are shared with the other encoders.
/// </summary>
public sealed class PageImageEncoderOptions : PageImageModelOptions
{
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
