namespace IndexKeeper.Core.Detect;

/// <summary>The platform side of a walk: open the root, resolve links, know the path limits.</summary>
internal interface IFolderSystem
{
    /// <summary>How two full paths are compared for the inside-the-root check.</summary>
    StringComparison PathComparison { get; }

    char Separator { get; }

    /// <summary>Opens the root by its real path (every link in it resolved); null with the reason if it cannot.</summary>
    IOpenFolder? OpenRoot(string path, out WalkProblemKind failureKind, out string detail);

    /// <summary>The real path of whatever <paramref name="fullPath"/> finally names; null with the reason if it cannot be resolved.</summary>
    string? RealPath(string fullPath, out WalkProblemKind failureKind, out string detail);

    /// <summary>True if a file at this path could not be opened by name.</summary>
    bool IsTooLong(string fullPath);
}
