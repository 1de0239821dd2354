namespace IndexKeeper.Core.Encoding.PageImages;

/// <summary>
/// The page-image encoder's model settings (<c>Encoder:PageImage:*</c>, docs/encoders.md): the exported page
/// and query graphs, the query vocabulary, and how a page becomes the page graph's input. Lists bind by
/// appending, so <see cref="PixelMean"/> and <see cref="PixelStd"/> have no default.
/// </summary>
public class PageImageModelOptions
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
    public List<double> PixelMean { get; set; } = [];

    /// <summary>Per-channel standard deviation (R, G, B) the centred values are divided by (no default).</summary>
    public List<double> PixelStd { get; set; } = [];

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
}
