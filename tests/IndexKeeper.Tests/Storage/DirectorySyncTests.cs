using IndexKeeper.Core.Storage;

namespace IndexKeeper.Tests.Storage;

public sealed class DirectorySyncTests
{
    [Fact]
    public void Syncs_an_existing_directory_and_fails_on_a_missing_one()
    {
        using var dir = new TempDirectory();
        DirectorySync.Flush(dir.Path);
        if (!OperatingSystem.IsWindows())
        {
            Assert.Throws<IOException>(() => DirectorySync.Flush(Path.Combine(dir.Path, "missing")));
        }
    }
}
