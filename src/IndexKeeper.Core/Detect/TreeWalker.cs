namespace IndexKeeper.Core.Detect;

/// <summary>
/// Depth-first walk over one root with a stack of open folders. Each folder's names are sorted ordinally,
/// then looked at one by one as the caller pulls, so a file deleted mid-walk is reported when reached.
/// Links: a link to a file is taken only when its real target lies inside the root's real path, and is
/// yielded with that target as its full path (the reader never goes through the link); links to folders
/// are never descended.
/// </summary>
internal sealed class TreeWalker(IFolderSystem system) : IRootWalker
{
    public IEnumerable<FoundFile> Walk(RootSpec root, Action<WalkProblem> onProblem, Action<PassedOverFile>? onPassedOver = null, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(root);
        ArgumentNullException.ThrowIfNull(onProblem);
        return WalkLazily(root, onProblem, onPassedOver, cancellationToken);
    }

    private IEnumerable<FoundFile> WalkLazily(RootSpec root, Action<WalkProblem> onProblem, Action<PassedOverFile>? onPassedOver, CancellationToken cancellationToken)
    {
        var globs = new RootGlobs(root, system.PathComparison);
        var top = system.OpenRoot(root.Path, out var rootFailure, out var rootDetail);
        if (top is null)
        {
            onProblem(new WalkProblem(root.Name, string.Empty, rootFailure, CoversSubtree: true, rootDetail));
            yield break;
        }

        var rootPrefix = top.FullPath.EndsWith(system.Separator) ? top.FullPath : top.FullPath + system.Separator;
        var stack = new Stack<Level>();
        try
        {
            stack.Push(Level.Of(top, string.Empty, globs, root.Name, onProblem));
            while (stack.Count > 0)
            {
                cancellationToken.ThrowIfCancellationRequested();
                var level = stack.Peek();
                if (level.Next == level.Names.Length)
                {
                    stack.Pop().Folder.Dispose();
                    continue;
                }

                var name = level.Names[level.Next++];
                var relative = level.RelativePrefix + name;
                var fullPath = level.Folder.FullPath.EndsWith(system.Separator)
                    ? level.Folder.FullPath + name
                    : level.Folder.FullPath + system.Separator + name;
                var entry = level.Folder.Stat(name);
                void Report(WalkProblemKind kind, bool coversSubtree, string detail) =>
                    onProblem(new WalkProblem(root.Name, relative, kind, coversSubtree, detail));

                switch (entry.Kind)
                {
                    // The entry's kind is unknown here: it may have been a folder, so the problem covers its subtree.
                    case EntryKind.Missing:
                        Report(WalkProblemKind.Vanished, true, entry.Error ?? "gone");
                        break;
                    case EntryKind.Inaccessible:
                        Report(WalkProblemKind.Inaccessible, true, entry.Error ?? "cannot be looked at");
                        break;
                    case EntryKind.Directory:
                        if (level.ExcludedFolders?.Contains(name) == true)
                        {
                            break;
                        }

                        if (system.IsTooLong(fullPath + system.Separator))
                        {
                            Report(WalkProblemKind.PathTooLong, true, "folder path too long to open its files by name");
                            break;
                        }

                        var child = level.Folder.OpenChild(name, entry.Stat.Identity, out var failure);
                        if (child is null)
                        {
                            Report(failure.Kind == EntryKind.Missing ? WalkProblemKind.Vanished : WalkProblemKind.Inaccessible, true, failure.Error ?? "cannot be listed");
                            break;
                        }

                        stack.Push(Level.Of(child, relative + "/", globs, root.Name, onProblem));
                        break;
                    case EntryKind.RegularFile:
                        if (level.SelectedFiles?.Contains(name) == false)
                        {
                            onPassedOver?.Invoke(new PassedOverFile(root.Name, relative, ReadableTypes.IsReadable(name)));
                            break;
                        }

                        if (system.IsTooLong(fullPath))
                        {
                            Report(WalkProblemKind.PathTooLong, false, "path too long to open by name");
                            break;
                        }

                        yield return new FoundFile(root.Name, relative, fullPath, entry.Stat);
                        break;
                    case EntryKind.Link:
                        var taken = FollowFileLink(
                            root,
                            selected: level.SelectedFiles?.Contains(name) != false,
                            folderExcluded: level.ExcludedFolders?.Contains(name) == true,
                            rootPrefix,
                            relative,
                            fullPath,
                            Report);
                        if (taken is not null)
                        {
                            yield return taken;
                        }

                        break;
                    default:
                        if (level.SelectedFiles?.Contains(name) != false)
                        {
                            Report(WalkProblemKind.NotRegularFile, false, "device, pipe or socket");
                        }

                        break;
                }
            }
        }
        finally
        {
            while (stack.Count > 0)
            {
                stack.Pop().Folder.Dispose();
            }
        }
    }

    private FoundFile? FollowFileLink(
        RootSpec root,
        bool selected,
        bool folderExcluded,
        string rootPrefix,
        string relative,
        string fullPath,
        Action<WalkProblemKind, bool, string> report)
    {
        var target = system.RealPath(fullPath, out var failureKind, out var detail);
        if (target is null)
        {
            if (selected)
            {
                report(failureKind, false, detail);
            }

            return null;
        }

        var targetStat = FileStatReader.Read(target);
        if (targetStat.Kind == EntryKind.Directory)
        {
            if (!folderExcluded)
            {
                report(WalkProblemKind.LinkToFolder, false, "links to folders are not descended");
            }

            return null;
        }

        if (!selected)
        {
            return null;
        }

        if (!target.StartsWith(rootPrefix, system.PathComparison))
        {
            report(WalkProblemKind.LinkOutsideRoot, false, "target lies outside the root");
            return null;
        }

        if (targetStat.Kind != EntryKind.RegularFile)
        {
            report(targetStat.Kind == EntryKind.Missing ? WalkProblemKind.BrokenLink : WalkProblemKind.NotRegularFile, false, targetStat.Error ?? targetStat.Kind.ToString());
            return null;
        }

        return new FoundFile(root.Name, relative, target, targetStat.Stat);
    }

    private sealed class Level
    {
        public required IOpenFolder Folder { get; init; }

        public required string RelativePrefix { get; init; }

        public required string[] Names { get; init; }

        /// <summary>Names selected if they are files; null: all.</summary>
        public required HashSet<string>? SelectedFiles { get; init; }

        /// <summary>Names excluded if they are folders; null: none.</summary>
        public required HashSet<string>? ExcludedFolders { get; init; }

        public int Next { get; set; }

        public static Level Of(IOpenFolder folder, string relativePrefix, RootGlobs globs, string rootName, Action<WalkProblem> onProblem)
        {
            if (folder.ListingError is not null)
            {
                onProblem(new WalkProblem(rootName, relativePrefix.TrimEnd('/'), WalkProblemKind.ListingIncomplete, CoversSubtree: true, folder.ListingError));
            }

            var names = folder.Names.ToArray();
            Array.Sort(names, StringComparer.Ordinal);
            return new Level
            {
                Folder = folder,
                RelativePrefix = relativePrefix,
                Names = names,
                SelectedFiles = globs.SelectFiles(relativePrefix, names),
                ExcludedFolders = globs.ExcludeFolders(relativePrefix, names),
            };
        }
    }
}
