namespace IndexKeeper.Service.Hosting;

/// <summary>Bytes of the files under a folder, tolerating files that vanish while being counted (the catalog's log, compaction's temp files).</summary>
internal static class DirectorySize
{
    public static long Of(string directory)
    {
        var total = 0L;
        foreach (var file in new DirectoryInfo(directory).EnumerateFiles("*", new EnumerationOptions { RecurseSubdirectories = true, IgnoreInaccessible = true }))
        {
            try
            {
                total += file.Length;
            }
            catch (FileNotFoundException)
            {
                // Gone between the listing and the look: not on disk any more.
            }
        }

        return total;
    }
}
