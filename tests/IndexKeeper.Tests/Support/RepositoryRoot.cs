namespace IndexKeeper.Tests.Support;

/// <summary>The checkout the tests run from: the nearest folder above the test binaries that holds IndexKeeper.sln.</summary>
internal static class RepositoryRoot
{
    public static string Path { get; } = Find();

    private static string Find()
    {
        var directory = new DirectoryInfo(AppContext.BaseDirectory);
        while (directory is not null && !File.Exists(System.IO.Path.Combine(directory.FullName, "IndexKeeper.sln")))
        {
            directory = directory.Parent;
        }

        return directory?.FullName ?? throw new InvalidOperationException("repository root not found above " + AppContext.BaseDirectory);
    }
}
