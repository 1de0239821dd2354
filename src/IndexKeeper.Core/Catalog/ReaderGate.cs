namespace IndexKeeper.Core.Catalog;

/// <summary>
/// Lets readers run beside the one writer (docs/catalog.md, "Readers beside a writer"): every reading
/// process holds a shared OS lock on <c>LOCK.readers</c> while its catalog and segment maps are open, and
/// the writer does the two things that would pull bytes from under a reader (folding LiteDB's log into
/// the data file, deleting segment files compaction retired) only while it holds the lock exclusively,
/// taken without waiting. A writer that cannot take it leaves that work for later; it never waits for readers.
/// </summary>
/// <remarks>
/// .NET takes <c>flock(LOCK_SH | LOCK_NB)</c> for a read-only <see cref="FileShare.Read"/> open on Unix and
/// <c>flock(LOCK_EX | LOCK_NB)</c> for <see cref="FileShare.None"/>; on Windows the share modes exclude each
/// other the same way. The writer holds the exclusive lock only for a checkpoint or a delete, so a reader
/// that finds it taken retries briefly.
/// </remarks>
public sealed class ReaderGate : IDisposable
{
    public const string FileName = "LOCK.readers";

    private static readonly TimeSpan ReaderPatience = TimeSpan.FromSeconds(60);

    private readonly FileStream? stream;

    private ReaderGate(FileStream? stream, string directory)
    {
        this.stream = stream;
        Directory = directory;
    }

    /// <summary>The index directory (full path).</summary>
    public string Directory { get; }

    /// <summary>
    /// Takes the shared lock for a reader. In a folder where the file is absent and cannot be created (a
    /// read-only index directory) no writer can exist either, and the reader goes ungated.
    /// </summary>
    public static ReaderGate EnterShared(string indexDirectory)
    {
        var directory = Path.GetFullPath(indexDirectory);
        var path = Path.Combine(directory, FileName);
        var giveUp = DateTime.UtcNow + ReaderPatience;
        while (true)
        {
            try
            {
                return new ReaderGate(new FileStream(path, FileMode.OpenOrCreate, FileAccess.Read, FileShare.Read), directory);
            }
            catch (Exception ex) when (ex is UnauthorizedAccessException or IOException && !File.Exists(path))
            {
                // An absent file is locked by no one; one that cannot be created cannot be by a writer either.
                return new ReaderGate(null, directory);
            }
            catch (IOException) when (DateTime.UtcNow < giveUp)
            {
                // The writer holds it for one checkpoint or delete; waiting is bounded by that.
                Thread.Sleep(10);
            }
        }
    }

    /// <summary>The exclusive lock for the writer, or null at once when a reader holds the shared one.</summary>
    public static ReaderGate? TryEnterExclusive(string indexDirectory)
    {
        var directory = Path.GetFullPath(indexDirectory);
        try
        {
            return new ReaderGate(new FileStream(Path.Combine(directory, FileName), FileMode.OpenOrCreate, FileAccess.ReadWrite, FileShare.None), directory);
        }
        catch (IOException)
        {
            return null;
        }
    }

    /// <summary>False when a reader found no gate file it could create (a read-only index directory).</summary>
    public bool Held => stream is not null;

    public void Dispose() => stream?.Dispose();
}
