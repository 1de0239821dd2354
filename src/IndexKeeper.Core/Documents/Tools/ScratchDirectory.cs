namespace IndexKeeper.Core.Documents.Tools;

/// <summary>A private temporary directory for one read (converter input, output and profile, OCR images), removed after.</summary>
internal sealed class ScratchDirectory : IDisposable
{
    public ScratchDirectory()
    {
        Path = System.IO.Path.Combine(System.IO.Path.GetTempPath(), "indexkeeper-read-" + Guid.NewGuid().ToString("N"));
        var created = Directory.CreateDirectory(Path);
        if (!OperatingSystem.IsWindows())
        {
            // Documents are private: only this user reads what is copied or drawn here.
            created.UnixFileMode = UnixFileMode.UserRead | UnixFileMode.UserWrite | UnixFileMode.UserExecute;
        }
    }

    public string Path { get; }

    public string File(string name) => System.IO.Path.Combine(Path, name);

    public void Dispose()
    {
        try
        {
            Directory.Delete(Path, recursive: true);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            // A killed converter may still hold a file for a moment; the temp directory is the system's to clean.
        }
    }
}
