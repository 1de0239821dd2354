using IndexKeeper.Core.Documents;

namespace IndexKeeper.Core.Encoding;

/// <summary>One page handed to an encoder: its key, its geometry and words, and where its file is (for image encoders).</summary>
public sealed record PageToEncode(PageKey Key, string SourcePath, int PageNumber, float Width, float Height, IReadOnlyList<PageWord> Words)
{
    /// <summary>Clockwise rotation a viewer shows the page with (0, 90, 180, 270); image encoders draw the page so.</summary>
    public int Rotation { get; init; }
}
