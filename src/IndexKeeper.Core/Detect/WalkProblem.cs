namespace IndexKeeper.Core.Detect;

/// <summary>An entry a walk passed over, and why.</summary>
/// <param name="RelativePath">Path under the root with '/' separators; empty for the root itself.</param>
/// <param name="CoversSubtree">
/// True when entries beneath the path may be affected too: the path is a folder or the root, or an entry
/// whose kind could not be seen (it may be a folder).
/// </param>
public sealed record WalkProblem(string Root, string RelativePath, WalkProblemKind Kind, bool CoversSubtree, string Detail)
{
    /// <summary>
    /// True when the walk could not tell what is there: the catalog's entries at this path (and beneath
    /// it, when <see cref="CoversSubtree"/>) must be kept as they are, not taken for deleted. False for
    /// entries skipped by policy (links, pipes), which are not documents of the root.
    /// </summary>
    public bool LeavesUnknown => Kind is WalkProblemKind.RootMissing or WalkProblemKind.RootInaccessible
        or WalkProblemKind.Inaccessible or WalkProblemKind.Vanished or WalkProblemKind.ListingIncomplete
        or WalkProblemKind.PathTooLong;
}
