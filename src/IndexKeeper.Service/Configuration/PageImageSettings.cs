using IndexKeeper.Core.Encoding.PageImages;

namespace IndexKeeper.Service.Configuration;

/// <summary>Maps <c>Encoder:*</c> and <c>Encoder:PageImage:*</c> onto the page-image encoder's options, and names its problems by setting path.</summary>
internal static class PageImageSettings
{
    private const string Section = "Encoder:PageImage:";

    // Checked under Encoder: already; the encoder's own copy of these checks would repeat them.
    private static readonly string[] SharedSettings = ["Dimensions:", "PoolFactor:", "IntraOpThreads:"];

    public static PageImageEncoderOptions ToEncoderOptions(EncoderOptions encoder)
    {
        var page = encoder.PageImage;
        return new PageImageEncoderOptions
        {
            PageModel = page.PageModel,
            PageInput = page.PageInput,
            PageOutput = page.PageOutput,
            InputWidth = page.InputWidth,
            InputHeight = page.InputHeight,
            PatchSize = page.PatchSize,
            Fit = page.Fit,
            PixelMean = page.PixelMean,
            PixelStd = page.PixelStd,
            RenderDpi = page.RenderDpi,
            QueryModel = page.QueryModel,
            QueryInput = page.QueryInput,
            QueryMaskInput = page.QueryMaskInput,
            QueryOutput = page.QueryOutput,
            QueryVocabulary = page.QueryVocabulary,
            QueryLowerCase = page.QueryLowerCase,
            QueryMaxTokens = page.QueryMaxTokens,
            Pdftoppm = page.Pdftoppm,
            RenderTimeoutSeconds = page.RenderTimeoutSeconds,
            Dimensions = encoder.Dimensions,
            PoolFactor = encoder.PoolFactor,
            IntraOpThreads = encoder.IntraOpThreads,
        };
    }

    public static IEnumerable<string> Validate(EncoderOptions encoder) =>
        ToEncoderOptions(encoder).Validate()
            .Where(e => !SharedSettings.Any(s => e.StartsWith(s, StringComparison.Ordinal)))
            .Select(Qualify);

    /// <summary>The encoder's messages start with the setting's own name; give them their full path.</summary>
    public static string Qualify(string message) => Section + message;
}
