using Microsoft.Win32.SafeHandles;

namespace IndexKeeper.Core.Detect;

/// <summary>
/// Reads the quick-check stat of a path or an open file: size, last write time and file identity
/// ((device, inode) on Linux via statx, (volume serial, file index) on Windows, <see cref="FileIdentity.None"/>
/// elsewhere). A path is looked at without following a link at its last component.
/// </summary>
public static class FileStatReader
{
    /// <summary>Looks at <paramref name="path"/> like lstat: a link is reported as <see cref="EntryKind.Link"/>.</summary>
    public static EntryStat Read(string path)
    {
        if (OperatingSystem.IsLinux())
        {
            return ReadLinux(LinuxNative.AtFdCwd, LinuxPathCodec.EncodeTerminated(path));
        }

        if (OperatingSystem.IsWindows())
        {
            return WindowsNative.StatNoFollow(path);
        }

        return ReadManaged(path);
    }

    /// <summary>The stat of an open file: what is being read, whatever its name now points at.</summary>
    /// <exception cref="IOException">The system refused to stat the handle.</exception>
    public static FileStat Read(SafeFileHandle handle)
    {
        ArgumentNullException.ThrowIfNull(handle);
        if (OperatingSystem.IsLinux())
        {
            var added = false;
            handle.DangerousAddRef(ref added);
            try
            {
                var stat = ReadLinux((int)handle.DangerousGetHandle(), [0], LinuxNative.AtEmptyPath);
                return stat.Kind is EntryKind.Missing or EntryKind.Inaccessible ? throw new IOException(stat.Error) : stat.Stat;
            }
            finally
            {
                if (added)
                {
                    handle.DangerousRelease();
                }
            }
        }

        if (OperatingSystem.IsWindows())
        {
            return WindowsNative.StatHandle(handle);
        }

        return new FileStat(RandomAccess.GetLength(handle), File.GetLastWriteTimeUtc(handle).Ticks, FileIdentity.None);
    }

    /// <summary>statx relative to <paramref name="directoryFd"/>; <paramref name="terminatedPath"/> ends with NUL.</summary>
    internal static unsafe EntryStat ReadLinux(int directoryFd, byte[] terminatedPath, int extraFlags = 0)
    {
        LinuxNative.Statx buffer;
        int result;
        fixed (byte* path = terminatedPath)
        {
            result = LinuxNative.StatX(directoryFd, path, LinuxNative.AtSymlinkNoFollow | extraFlags, LinuxNative.StatxWanted, &buffer);
        }

        if (result != 0)
        {
            var errorNumber = System.Runtime.InteropServices.Marshal.GetLastPInvokeError();
            return EntryStat.Failed(LinuxNative.KindOfError(errorNumber), LinuxNative.Describe(errorNumber));
        }

        return new EntryStat(LinuxNative.KindOf(buffer.Mode), LinuxNative.ToFileStat(buffer), null);
    }

    private static EntryStat ReadManaged(string path)
    {
        try
        {
            var info = new FileInfo(path);
            if (info.LinkTarget is not null)
            {
                return new EntryStat(EntryKind.Link, new FileStat(0, info.LastWriteTimeUtc.Ticks, FileIdentity.None), null);
            }

            if ((info.Attributes & FileAttributes.Directory) != 0 && (int)info.Attributes != -1)
            {
                return new EntryStat(EntryKind.Directory, new FileStat(0, info.LastWriteTimeUtc.Ticks, FileIdentity.None), null);
            }

            return info.Exists
                ? new EntryStat(EntryKind.RegularFile, new FileStat(info.Length, info.LastWriteTimeUtc.Ticks, FileIdentity.None), null)
                : EntryStat.Failed(EntryKind.Missing, "not found");
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            return EntryStat.Failed(EntryKind.Inaccessible, e.Message);
        }
    }
}
