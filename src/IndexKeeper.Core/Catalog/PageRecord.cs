namespace IndexKeeper.Core.Catalog;

/// <summary>One page key (collection <c>pages</c>): how many page locations hold it, its geometry, and where its words are.</summary>
public sealed class PageRecord
{
    /// <summary>The page key, 64 hex digits.</summary>
    public string Id { get; set; } = string.Empty;

    /// <summary>Page locations in live documents holding this key; the record is removed at zero.</summary>
    public int References { get; set; }

    public float Width { get; set; }

    public float Height { get; set; }

    public int Rotation { get; set; }

    /// <summary>
    /// Words and boxes as schema version 1 kept them, inside the record. Since version 2 they are written to
    /// the page-word store (<see cref="WordsAt"/>) and this stays empty; a version-1 record keeps its words
    /// here and is read from here (docs/catalog.md). In memory, a page not yet committed carries its words here.
    /// </summary>
    public List<WordRecord> Words { get; set; } = [];

    /// <summary>Where the page's words lie in the page-word store; null when they are in <see cref="Words"/> or there are none.</summary>
    public WordsAtRecord? WordsAt { get; set; }

    /// <summary>A location where the page was seen (for encoders that render it): root, path, 1-based page.</summary>
    public string SourceRoot { get; set; } = string.Empty;

    public string SourcePath { get; set; } = string.Empty;

    public int SourcePage { get; set; }

    public DateTime FirstSeenUtc { get; set; }
}
