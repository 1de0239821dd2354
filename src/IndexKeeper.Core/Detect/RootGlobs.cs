using Microsoft.Extensions.FileSystemGlobbing;

namespace IndexKeeper.Core.Detect;

/// <summary>
/// A root's include/exclude globs, matched against '/'-separated paths relative to the root. Files are
/// decided by the globbing library itself. A folder is skipped without being listed when an exclude glob
/// matches the folder's own path (the library excludes a matched folder's whole content), or when an
/// exclude glob "P/**" has a P that matches it. Include globs never prune a folder: a match may lie deeper.
/// </summary>
internal sealed class RootGlobs
{
    private readonly Matcher files;
    private readonly Matcher? folders;

    public RootGlobs(RootSpec root, StringComparison comparison)
    {
        ArgumentNullException.ThrowIfNull(root);
        files = new Matcher(comparison);
        if (root.Include.Count == 0)
        {
            files.AddInclude("**/*");
        }

        foreach (var include in root.Include)
        {
            files.AddInclude(include);
        }

        foreach (var exclude in root.Exclude)
        {
            files.AddExclude(exclude);
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

    public bool SelectsFile(string relativePath) => files.Match(relativePath).HasMatches;

    public bool ExcludesFolder(string relativePath) => folders?.Match(relativePath).HasMatches ?? false;
}
