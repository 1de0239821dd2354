namespace IndexKeeper.Core.Catalog;

/// <summary>One page key (collection <c>pages</c>): how many page locations hold it, and what text encoders need.</summary>
public sealed class PageRecord
{
    /// <summary>The page key, 64 hex digits.</summary>
    public string Id { get; set; } = string.Empty;

    /// <summary>Page locations in live documents holding this key; the record is removed at zero.</summary>
    public int References { get; set; }

    public float Width { get; set; }

    public float Height { get; set; }

    public int Rotation { get; set; }

    public List<WordRecord> Words { get; set; } = [];

    /// <summary>A location where the page was seen (for encoders that render it): root, path, 1-based page.</summary>
    public string SourceRoot { get; set; } = string.Empty;

    public string SourcePath { get; set; } = string.Empty;

    public int SourcePage { get; set; }

    public DateTime FirstSeenUtc { get; set; }
}
