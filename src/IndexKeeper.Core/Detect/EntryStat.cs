namespace IndexKeeper.Core.Detect;

/// <summary>One look at a path: its kind and, for files, directories and links, its quick-check stat.</summary>
/// <param name="Error">Why the entry is <see cref="EntryKind.Missing"/> or <see cref="EntryKind.Inaccessible"/>; null otherwise.</param>
public readonly record struct EntryStat(EntryKind Kind, FileStat Stat, string? Error)
{
    internal static EntryStat Failed(EntryKind kind, string error) => new(kind, default, error);
}
