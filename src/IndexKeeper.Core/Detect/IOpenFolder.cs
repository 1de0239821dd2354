namespace IndexKeeper.Core.Detect;

/// <summary>A folder held open by a walk: its names (read at once), and its entries looked at one by one.</summary>
internal interface IOpenFolder : IDisposable
{
    /// <summary>The folder's real full path, without a trailing separator (except for a file-system root).</summary>
    string FullPath { get; }

    /// <summary>The entries' names, without "." and "..", in no particular order.</summary>
    IReadOnlyList<string> Names { get; }

    /// <summary>Set when the listing stopped before its end.</summary>
    string? ListingError { get; }

    /// <summary>Looks at one entry without following a link.</summary>
    EntryStat Stat(string name);

    /// <summary>Opens a child folder, provided it is still the folder <paramref name="expected"/> names (not a link put in its place).</summary>
    IOpenFolder? OpenChild(string name, FileIdentity expected, out EntryStat failure);
}
