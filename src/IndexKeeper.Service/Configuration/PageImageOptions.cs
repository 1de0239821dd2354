namespace IndexKeeper.Service.Configuration;

/// <summary>
/// Settings of the <c>page-image</c> encoder (<c>Encoder:PageImage:*</c>), for a late-interaction vision
/// model a user exported to ONNX; see docs/encoders.md. d, pooling and threads come from <c>Encoder:*</c>.
/// </summary>
public sealed class PageImageOptions
{
    public string PageModel { get; set; } = string.Empty;

    public string PageInput { get; set; } = "pixel_values";

    public string PageOutput { get; set; } = "embeddings";

    public int InputWidth { get; set; } = 448;

    public int InputHeight { get; set; } = 448;

    public int PatchSize { get; set; } = 32;

    /// <summary><c>letterbox</c> or <c>stretch</c>.</summary>
    public string Fit { get; set; } = "letterbox";

    /// <summary>Three values (R, G, B); the model's export names them. Arrays bind by appending, so there is no default.</summary>
    public List<double> PixelMean { get; set; } = [];

    public List<double> PixelStd { get; set; } = [];

    public int RenderDpi { get; set; } = 72;

    public string QueryModel { get; set; } = string.Empty;

    public string QueryInput { get; set; } = "input_ids";

    public string QueryMaskInput { get; set; } = string.Empty;

    public string QueryOutput { get; set; } = "embeddings";

    public string QueryVocabulary { get; set; } = string.Empty;

    public bool QueryLowerCase { get; set; } = true;

    public int QueryMaxTokens { get; set; } = 64;

    /// <summary>Poppler's pdftoppm: a path, or a name looked up on PATH.</summary>
    public string Pdftoppm { get; set; } = "pdftoppm";

    public double RenderTimeoutSeconds { get; set; } = 120;
}
