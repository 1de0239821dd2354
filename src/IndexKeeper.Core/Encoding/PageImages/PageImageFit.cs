namespace IndexKeeper.Core.Encoding.PageImages;

/// <summary>The ways a page is fitted into the page graph's input (<see cref="PageImageEncoderOptions.Fit"/>).</summary>
public static class PageImageFit
{
    /// <summary>Keep the page's proportions, centre it, and pad the rest with white (paper).</summary>
    public const string Letterbox = "letterbox";

    /// <summary>Scale width and height independently to fill the input.</summary>
    public const string Stretch = "stretch";
}
