namespace IndexKeeper.Service.Configuration;

/// <summary>One configured root: a stable name, a folder, and glob filters relative to it.</summary>
public sealed class RootOptions
{
    /// <summary>
    /// Stable name stored in the catalog: the root's identity, whatever its Path or place in the list.
    /// Left out, it is derived from the folder and the place (<see cref="RootNaming.Derived"/>), as
    /// <c>--root DIR</c> does. Renaming is docs/cli.md, "Root names".
    /// </summary>
    public string Name { get; set; } = string.Empty;

    /// <summary>True when no Name was given and <see cref="Name"/> was derived (named so in errors); never bound.</summary>
    internal bool NameDerived { get; set; }

    public string Path { get; set; } = string.Empty;

    /// <summary>Globs a file must match (empty: the readable types, <see cref="IndexKeeper.Core.Detect.ReadableTypes"/>, in any letter case). Example: <c>manuals/**/*.pdf</c>.</summary>
    public List<string> Include { get; set; } = [];

    /// <summary>
    /// How often the daemon walks this root besides its change notifications, in minutes; 0: never (the
    /// full walk of every root, <c>Detect:FullWalkMinutes</c>, still runs). Unset: <c>Detect:NetworkPollMinutes</c>
    /// for a root on a network share, never for a local one.
    /// </summary>
    public double? PollMinutes { get; set; }

    /// <summary>Globs that drop files or whole folders. Example: <c>**/~$*</c>, <c>tmp/**</c>.</summary>
    public List<string> Exclude { get; set; } = [];
}
