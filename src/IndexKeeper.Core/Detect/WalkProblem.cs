namespace IndexKeeper.Core.Detect;

/// <summary>An entry a walk passed over, and why.</summary>
/// <param name="RelativePath">Path under the root with '/' separators; empty for the root itself.</param>
/// <param name="IsFolder">True when the entry is a folder (or the root): the problem covers everything beneath it.</param>
public sealed record WalkProblem(string Root, string RelativePath, WalkProblemKind Kind, bool IsFolder, string Detail)
{
    /// <summary>
    /// True when the walk could not tell what is there: the catalog's entries at this path (and beneath it,
    /// for a folder) must be kept as they are, not taken for deleted. False for entries skipped by policy
    /// (links, pipes), which are not documents of the root.
    /// </summary>
    public bool LeavesUnknown => Kind is WalkProblemKind.RootMissing or WalkProblemKind.RootInaccessible
        or WalkProblemKind.Inaccessible or WalkProblemKind.Vanished or WalkProblemKind.ListingIncomplete
        or WalkProblemKind.PathTooLong;
}
