namespace IndexKeeper.Core.Detect;

/// <summary>Why a walk passed over an entry.</summary>
public enum WalkProblemKind
{
    /// <summary>The root does not exist (unmounted share, removed folder). Not a mass deletion.</summary>
    RootMissing,

    /// <summary>The root exists but cannot be listed, or is not a folder.</summary>
    RootInaccessible,

    /// <summary>A folder or file this process may not look at (permission denied, I/O error).</summary>
    Inaccessible,

    /// <summary>Listed, then gone before it could be looked at.</summary>
    Vanished,

    /// <summary>A folder whose listing stopped part-way; the entries read so far were walked.</summary>
    ListingIncomplete,

    /// <summary>The full path is longer than the system can open by name.</summary>
    PathTooLong,

    /// <summary>A link whose target lies outside the root: skipped, never read.</summary>
    LinkOutsideRoot,

    /// <summary>A link to a folder: links to folders are never descended.</summary>
    LinkToFolder,

    /// <summary>A link whose target does not exist or loops.</summary>
    BrokenLink,

    /// <summary>A device, pipe or socket that matched the globs.</summary>
    NotRegularFile,
}
