using System.Runtime.InteropServices;
using IndexKeeper.Core.Faults;

namespace IndexKeeper.Core.Storage;

/// <summary>
/// Makes a directory's entries durable after a file in it was created, renamed or deleted. POSIX makes
/// a new name durable only when the directory itself is fsynced, and .NET cannot open a directory as a
/// stream, so on Linux and macOS this opens it read-only and calls fsync(2) through libc. On Windows
/// NTFS journals directory changes with the file's own metadata and there is nothing to do.
/// </summary>
internal static partial class DirectorySync
{
    private const int ReadOnly = 0;

    public static void Flush(string directory)
    {
        if (OperatingSystem.IsWindows())
        {
            return;
        }

        FaultInjection.Reach(FaultPoints.DirectoryFsyncBefore);
        var fd = Open(directory, ReadOnly);
        if (fd < 0)
        {
            throw new IOException($"cannot open directory {directory} to sync it (errno {Marshal.GetLastPInvokeError()})");
        }

        try
        {
            if (Fsync(fd) != 0)
            {
                throw new IOException($"fsync of directory {directory} failed (errno {Marshal.GetLastPInvokeError()})");
            }
        }
        finally
        {
            _ = Close(fd);
        }

        FaultInjection.Reach(FaultPoints.DirectoryFsyncAfter);
    }

    [LibraryImport("libc", EntryPoint = "open", SetLastError = true, StringMarshalling = StringMarshalling.Utf8)]
    private static partial int Open(string path, int flags);

    [LibraryImport("libc", EntryPoint = "fsync", SetLastError = true)]
    private static partial int Fsync(int fd);

    [LibraryImport("libc", EntryPoint = "close", SetLastError = true)]
    private static partial int Close(int fd);
}
