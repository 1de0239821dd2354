using Microsoft.Extensions.FileSystemGlobbing;

namespace IndexKeeper.Core.Detect;

/// <summary>
/// A root's include/exclude globs, matched against '/'-separated paths relative to the root. Files are
/// decided by the globbing library itself. A folder is skipped without being listed when an exclude glob
/// matches the folder's own path (the library excludes a matched folder's whole content), or when an
/// exclude glob "P/**" has a P that matches it. Include globs never prune a folder: a match may lie deeper.
/// The library is asked once per folder for all its names: one call per name costs ten times as much.
/// A root without include globs takes the readable types (<see cref="ReadableTypes"/>, any letter case).
/// </summary>
internal sealed class RootGlobs
{
    // Any absolute path does: the library wants a base folder, matching only uses the relative paths.
    private static readonly string MatchBase = Path.GetFullPath(Path.DirectorySeparatorChar.ToString());

    private readonly Matcher? files;
    private readonly Matcher? folders;
    private readonly bool readableOnly;

    public RootGlobs(RootSpec root, StringComparison comparison)
    {
        ArgumentNullException.ThrowIfNull(root);
        readableOnly = root.Include.Count == 0;
        if (root.Include.Count > 0 || root.Exclude.Count > 0)
        {
            files = new Matcher(comparison);
            files.AddIncludePatterns(root.Include.Count == 0 ? ["**/*"] : root.Include);
            files.AddExcludePatterns(root.Exclude);
        }

        if (root.Exclude.Count > 0)
        {
            folders = new Matcher(comparison);
            foreach (var exclude in root.Exclude)
            {
                folders.AddInclude(exclude);
                if (exclude.EndsWith("/**", StringComparison.Ordinal) && exclude.Length > 3)
                {
                    folders.AddInclude(exclude[..^3]);
                }
            }
        }
    }

    /// <summary>Of a folder's <paramref name="names"/> (files and folders alike), those selected if they are files; null means all.</summary>
    public HashSet<string>? SelectFiles(string relativePrefix, IReadOnlyCollection<string> names)
    {
        var matched = MatchAll(files, relativePrefix, names);
        if (!readableOnly)
        {
            return matched;
        }

        var readable = new HashSet<string>(StringComparer.Ordinal);
        foreach (var name in (IEnumerable<string>?)matched ?? names)
        {
            if (ReadableTypes.IsReadable(name))
            {
                readable.Add(name);
            }
        }

        return readable;
    }

    /// <summary>Of a folder's <paramref name="names"/>, those excluded if they are folders; null means none.</summary>
    public HashSet<string>? ExcludeFolders(string relativePrefix, IReadOnlyCollection<string> names) =>
        folders is null ? null : MatchAll(folders, relativePrefix, names) ?? [];

    private static HashSet<string>? MatchAll(Matcher? matcher, string relativePrefix, IReadOnlyCollection<string> names)
    {
        if (matcher is null)
        {
            return null;
        }

        var matched = new HashSet<string>(StringComparer.Ordinal);
        if (names.Count == 0)
        {
            return matched;
        }

        // The library reports paths with '/' whatever it was given; key both sides the same way.
        var byPath = new Dictionary<string, string>(names.Count, StringComparer.Ordinal);
        foreach (var name in names)
        {
            byPath[(relativePrefix + name).Replace('\\', '/')] = name;
        }

        foreach (var match in matcher.Match(MatchBase, byPath.Keys).Files)
        {
            if (byPath.TryGetValue(match.Path.Replace('\\', '/'), out var name))
            {
                matched.Add(name);
            }
        }

        return matched;
    }
}
