namespace IndexKeeper.Core.Documents;

/// <summary>What the reader learned about one page: its key, geometry and words.</summary>
/// <param name="Number">1-based position of the page in its document.</param>
/// <param name="Width">Width of the visible page area (crop box) in page units, before rotation.</param>
/// <param name="Height">Height of the visible page area in page units, before rotation.</param>
/// <param name="Rotation">Clockwise rotation in degrees: 0, 90, 180 or 270.</param>
public sealed record PageContent(
    int Number,
    PageKey Key,
    float Width,
    float Height,
    int Rotation,
    IReadOnlyList<PageWord> Words);
