namespace IndexKeeper.Core.Detect;

/// <summary>A folder listed through .NET's enumeration; entries are looked at by full path.</summary>
internal sealed class ManagedFolder : IOpenFolder
{
    private static readonly EnumerationOptions ListAll = new()
    {
        RecurseSubdirectories = false,
        IgnoreInaccessible = false,
        AttributesToSkip = 0,
        ReturnSpecialDirectories = false,
        MatchType = MatchType.Simple,
    };

    private ManagedFolder(string fullPath, IReadOnlyList<string> names, string? listingError)
    {
        FullPath = fullPath;
        Names = names;
        ListingError = listingError;
    }

    public string FullPath { get; }

    public IReadOnlyList<string> Names { get; }

    public string? ListingError { get; }

    public static ManagedFolder? Open(string fullPath, out EntryStat failure)
    {
        IEnumerator<string> entries;
        try
        {
            // The enumerator opens the folder when created, so open failures surface here.
            entries = Directory.EnumerateFileSystemEntries(fullPath, "*", ListAll).GetEnumerator();
        }
        catch (DirectoryNotFoundException e)
        {
            failure = EntryStat.Failed(EntryKind.Missing, e.Message);
            return null;
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            failure = EntryStat.Failed(EntryKind.Inaccessible, e.Message);
            return null;
        }

        var names = new List<string>();
        string? listingError = null;
        using (entries)
        {
            try
            {
                while (entries.MoveNext())
                {
                    names.Add(Path.GetFileName(entries.Current));
                }
            }
            catch (Exception e) when (e is IOException or UnauthorizedAccessException)
            {
                listingError = e.Message;
            }
        }

        failure = default;
        return new ManagedFolder(fullPath, names, listingError);
    }

    public EntryStat Stat(string name) => FileStatReader.Read(Path.Join(FullPath, name));

    public IOpenFolder? OpenChild(string name, FileIdentity expected, out EntryStat failure)
    {
        var path = Path.Join(FullPath, name);
        var now = FileStatReader.Read(path);
        if (now.Kind != EntryKind.Directory || now.Stat.Identity != expected)
        {
            failure = EntryStat.Failed(EntryKind.Missing, "replaced by another entry while being opened");
            return null;
        }

        return Open(path, out failure);
    }

    public void Dispose()
    {
        // Nothing held: the listing was read at once.
    }
}
