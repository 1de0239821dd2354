namespace IndexKeeper.Demo;

/// <summary>The kinds of change the scripted second day makes.</summary>
public enum DemoChangeKind
{
    /// <summary>One page's text changed and the PDF saved again.</summary>
    PageEdited,

    /// <summary>A file copied to another folder.</summary>
    Copied,

    /// <summary>A file renamed in its folder.</summary>
    Renamed,

    /// <summary>A file moved to another folder.</summary>
    Moved,

    /// <summary>A file deleted.</summary>
    Deleted,

    /// <summary>Only the modification time changed; the bytes are the same.</summary>
    Touched,

    /// <summary>Saved again with only the document metadata changed; every page shows the same.</summary>
    MetadataResaved,

    /// <summary>A new file.</summary>
    Added,

    /// <summary>Pages put in another order and one new page inserted.</summary>
    PagesReorderedAndInserted,
}
