namespace IndexKeeper.Core.Detect;

/// <summary>What a path names, seen without following a link at its last component.</summary>
public enum EntryKind
{
    /// <summary>Nothing there (never existed, or vanished).</summary>
    Missing,

    /// <summary>Something there that this process may not look at (permission denied, name too long, I/O error).</summary>
    Inaccessible,

    RegularFile,

    Directory,

    /// <summary>A symbolic link, or on Windows any reparse point (junctions, mount points, cloud placeholders).</summary>
    Link,

    /// <summary>A device, pipe or socket: never read, a pipe could block a reader forever.</summary>
    Other,
}
