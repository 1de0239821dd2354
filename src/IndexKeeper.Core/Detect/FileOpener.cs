using System.Runtime.InteropServices;
using Microsoft.Win32.SafeHandles;

namespace IndexKeeper.Core.Detect;

/// <summary>
/// Opens a found file for reading by the path the walker yielded. Use it instead of <see cref="File.OpenRead"/>:
/// on Linux it opens names that are not valid UTF-8 (which .NET's own APIs cannot), and everywhere it refuses
/// a path that is no longer the regular file it was a moment ago (replaced by a link, a pipe or another file).
/// </summary>
public static class FileOpener
{
    /// <summary>Opens <paramref name="path"/> for sequential reading; the stream owns the handle.</summary>
    /// <exception cref="FileNotFoundException">Nothing at the path.</exception>
    /// <exception cref="UnauthorizedAccessException">Permission denied.</exception>
    /// <exception cref="IOException">Not a regular file, or it changed while being opened.</exception>
    public static FileStream OpenRead(string path)
    {
        var before = FileStatReader.Read(path);
        switch (before.Kind)
        {
            case EntryKind.RegularFile:
                break;
            case EntryKind.Missing:
                throw new FileNotFoundException(before.Error, path);
            case EntryKind.Inaccessible:
                throw new UnauthorizedAccessException($"{path}: {before.Error}");
            default:
                throw new IOException($"{path}: not a regular file ({before.Kind})");
        }

        if (!TryOpen(path, out var handle, out var failure))
        {
            throw failure.Kind == EntryKind.Missing
                ? new FileNotFoundException(failure.Error, path)
                : new UnauthorizedAccessException($"{path}: {failure.Error}");
        }

        if (FileStatReader.Read(handle).Identity != before.Stat.Identity)
        {
            handle.Dispose();
            throw new IOException($"{path}: replaced while being opened");
        }

        return new FileStream(handle, FileAccess.Read, bufferSize: 0);
    }

    /// <summary>Opens for reading without throwing; <paramref name="failure"/> says why not.</summary>
    internal static bool TryOpen(string path, out SafeFileHandle handle, out EntryStat failure)
    {
        if (OperatingSystem.IsLinux())
        {
            return TryOpenLinux(path, out handle, out failure);
        }

        try
        {
            handle = File.OpenHandle(path, FileMode.Open, FileAccess.Read, FileShare.ReadWrite | FileShare.Delete, FileOptions.SequentialScan);
            failure = default;
            return true;
        }
        catch (Exception e) when (e is FileNotFoundException or DirectoryNotFoundException)
        {
            handle = new SafeFileHandle();
            failure = EntryStat.Failed(EntryKind.Missing, e.Message);
            return false;
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            handle = new SafeFileHandle();
            failure = EntryStat.Failed(EntryKind.Inaccessible, e.Message);
            return false;
        }
    }

    private static unsafe bool TryOpenLinux(string path, out SafeFileHandle handle, out EntryStat failure)
    {
        var bytes = LinuxPathCodec.EncodeTerminated(path);
        int fd;
        int errorNumber;
        do
        {
            // Non-blocking so that a pipe put in the file's place cannot stall the open; callers compare
            // the opened file's identity with the one they expected instead of relying on O_NOFOLLOW.
            fixed (byte* pointer = bytes)
            {
                fd = LinuxNative.OpenAt(LinuxNative.AtFdCwd, pointer, LinuxNative.OpenReadOnly | LinuxNative.OpenNonBlock | LinuxNative.OpenCloseOnExec);
            }

            errorNumber = fd < 0 ? Marshal.GetLastPInvokeError() : 0;
        }
        while (fd < 0 && errorNumber == LinuxNative.EINTR);

        if (fd < 0)
        {
            handle = new SafeFileHandle();
            failure = EntryStat.Failed(LinuxNative.KindOfError(errorNumber), LinuxNative.Describe(errorNumber));
            return false;
        }

        handle = new SafeFileHandle(fd, ownsHandle: true);
        failure = default;
        return true;
    }
}
