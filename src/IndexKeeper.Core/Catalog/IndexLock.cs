using System.Globalization;

namespace IndexKeeper.Core.Catalog;

/// <summary>
/// One writer per index: an exclusive OS lock on <c>LOCK</c> in the index directory, held for the life of
/// the process's use of the index and released by the OS on any exit, even a kill. LiteDB's direct mode
/// does not guard against a second process on Linux, so nothing opens the catalog without this lock.
/// </summary>
/// <remarks>
/// .NET takes <c>flock(LOCK_EX | LOCK_NB)</c> for <see cref="FileShare.None"/> on Unix and a share-mode
/// lock on Windows. The holder's process id goes into a separate file, <c>LOCK.owner</c>, because the
/// locked file cannot be opened by the process that wants to name the holder.
/// </remarks>
public sealed class IndexLock : IDisposable
{
    public const string LockFileName = "LOCK";
    public const string OwnerFileName = "LOCK.owner";

    private readonly FileStream stream;

    private IndexLock(FileStream stream, string directory)
    {
        this.stream = stream;
        Directory = directory;
    }

    public string Directory { get; }

    /// <summary>Creates the directory if needed and takes the lock, or throws <see cref="IndexLockedException"/>.</summary>
    public static IndexLock Acquire(string indexDirectory, string purpose)
    {
        var directory = Path.GetFullPath(indexDirectory);
        System.IO.Directory.CreateDirectory(directory);
        var lockPath = Path.Combine(directory, LockFileName);
        var ownerPath = Path.Combine(directory, OwnerFileName);
        FileStream stream;
        try
        {
            stream = new FileStream(lockPath, FileMode.OpenOrCreate, FileAccess.ReadWrite, FileShare.None);
        }
        catch (IOException)
        {
            var (pid, text, holderPurpose) = ReadOwner(ownerPath);
            throw new IndexLockedException(
                $"The index '{directory}' is in use by {text}. Only one process may write an index; stop it or use another --index.",
                pid,
                holderPurpose);
        }

        var owner = string.Create(
            CultureInfo.InvariantCulture,
            $"{Environment.ProcessId}\n{Environment.MachineName}\n{DateTime.UtcNow:O}\n{purpose}\n");
        File.WriteAllText(ownerPath, owner);
        return new IndexLock(stream, directory);
    }

    public void Dispose()
    {
        try
        {
            File.Delete(Path.Combine(Directory, OwnerFileName));
        }
        catch (IOException)
        {
            // A stale owner file is harmless: it is rewritten by the next holder.
        }

        stream.Dispose();
    }

    private static (int? Pid, string Text, string? Purpose) ReadOwner(string ownerPath)
    {
        try
        {
            var lines = File.ReadAllLines(ownerPath);
            if (lines.Length >= 4 && int.TryParse(lines[0], NumberStyles.None, CultureInfo.InvariantCulture, out var pid))
            {
                return (pid, $"process {pid} on {lines[1]} ('{lines[3]}', since {lines[2]})", lines[3]);
            }
        }
        catch (IOException)
        {
        }

        return (null, "another process (its id could not be read)", null);
    }
}
