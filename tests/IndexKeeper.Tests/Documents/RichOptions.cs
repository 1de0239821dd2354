namespace IndexKeeper.Tests.Documents;

/// <summary>The knobs of <see cref="SampleDocuments.Rich"/>; each one is a visible edit of some pages.</summary>
internal sealed record RichOptions
{
    public string Page1Word { get; init; } = "intake";

    public int Page3TextX { get; init; } = 72;

    public int Page3Width { get; init; } = 595;

    public int NodeRotate { get; init; } = 90;

    public int Page5Rotate { get; init; }

    public string FormText { get; init; } = "Screen 4 cleaned";

    public int Form2LineEnd { get; init; } = 50;

    public int WidthOfA { get; init; } = 556;

    public int FontProgramByteIndex { get; init; } = 100;

    public byte FontProgramFlip { get; init; }

    public string FillAlpha { get; init; } = "0.5";

    public int ImagePixelIndex { get; init; } = 7;

    public byte ImagePixelFlip { get; init; }

    public string StampText { get; init; } = "CHECKED";

    public string HiddenSquareColour { get; init; } = "0 0 1 rg";

    public string StampModified { get; init; } = "D:20260101000000Z";
}
