namespace IndexKeeper.Core.Detect;

/// <summary>
/// Walks through .NET's file APIs (Windows, macOS). Entries are looked up by full path, so the guard
/// against a folder swapped for a link mid-walk is the identity check in <see cref="ManagedFolder.OpenChild"/>;
/// on Windows links are resolved by the system's final-path lookup (links, junctions and mount points alike).
/// </summary>
internal sealed class ManagedFolderSystem : IFolderSystem
{
    public StringComparison PathComparison =>
        OperatingSystem.IsWindows() || OperatingSystem.IsMacOS() ? StringComparison.OrdinalIgnoreCase : StringComparison.Ordinal;

    public char Separator => Path.DirectorySeparatorChar;

    public IOpenFolder? OpenRoot(string path, out WalkProblemKind failureKind, out string detail)
    {
        var stat = FileStatReader.Read(path);
        if (stat.Kind == EntryKind.Missing)
        {
            failureKind = WalkProblemKind.RootMissing;
            detail = stat.Error ?? "not found";
            return null;
        }

        failureKind = WalkProblemKind.RootInaccessible;
        var real = RealPath(path, out _, out detail);
        if (real is null)
        {
            return null;
        }

        var realStat = FileStatReader.Read(real);
        if (realStat.Kind != EntryKind.Directory)
        {
            detail = realStat.Error ?? "not a folder";
            return null;
        }

        var folder = ManagedFolder.Open(Path.TrimEndingDirectorySeparator(real), out var failure);
        detail = failure.Error ?? string.Empty;
        return folder;
    }

    public string? RealPath(string fullPath, out WalkProblemKind failureKind, out string detail)
    {
        failureKind = WalkProblemKind.BrokenLink;
        if (OperatingSystem.IsWindows())
        {
            var real = WindowsNative.RealPath(fullPath, out var problem);
            detail = problem ?? string.Empty;
            return real;
        }

        try
        {
            var info = new FileInfo(fullPath);
            var target = info.LinkTarget is null ? info : info.ResolveLinkTarget(returnFinalTarget: true);
            if (target is null || !(target.Exists || Directory.Exists(target.FullName)))
            {
                detail = "target does not exist";
                return null;
            }

            detail = string.Empty;
            return Path.GetFullPath(target.FullName);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            failureKind = e is UnauthorizedAccessException ? WalkProblemKind.Inaccessible : WalkProblemKind.BrokenLink;
            detail = e.Message;
            return null;
        }
    }

    public bool IsTooLong(string fullPath) => false;
}
