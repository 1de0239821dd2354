namespace IndexKeeper.Core.Detect;

/// <summary>What a hash says about a file the quick check could not vouch for.</summary>
public enum HashVerdict
{
    /// <summary>Touched but identical: store the new stat, keep the page keys, read nothing.</summary>
    Unchanged,

    /// <summary>Different bytes, or no stored hash to compare with: the file must be read.</summary>
    ContentChanged,

    /// <summary>The file changed while being hashed: leave the record as it is and try again once it settles.</summary>
    Retry,

    /// <summary>Gone since the walk: the next walk settles whether it was deleted or moved.</summary>
    Vanished,

    /// <summary>Not readable (permission, I/O error, not a regular file any more): keep the record, report it.</summary>
    Unreadable,
}
