namespace IndexKeeper.Core.Catalog;

/// <summary>A page word as stored: text and box (left, bottom, right, top) in page units.</summary>
public sealed class WordRecord
{
    public string T { get; set; } = string.Empty;

    public float L { get; set; }

    public float B { get; set; }

    public float R { get; set; }

    public float U { get; set; }
}
