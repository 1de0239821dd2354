using System.Runtime.InteropServices;
using System.Runtime.Versioning;
using Microsoft.Win32.SafeHandles;

namespace IndexKeeper.Core.Detect;

/// <summary>
/// The Win32 calls behind stat, identity and real path on Windows. An entry is opened for attributes only
/// (no read access needed) and without following reparse points, which makes it the Windows "lstat".
/// </summary>
[SupportedOSPlatform("windows")]
internal static unsafe partial class WindowsNative
{
    private const uint FileReadAttributes = 0x80;
    private const uint FileShareAll = 0x7; // read | write | delete
    private const uint OpenExisting = 3;
    private const uint FlagBackupSemantics = 0x02000000; // needed to open a directory
    private const uint FlagOpenReparsePoint = 0x00200000; // do not follow the link
    private const uint AttributeDirectory = 0x10;
    private const uint AttributeReparsePoint = 0x400;

    private const int ErrorFileNotFound = 2;
    private const int ErrorPathNotFound = 3;

    [StructLayout(LayoutKind.Sequential)]
    private struct ByHandleFileInformation
    {
        public uint FileAttributes;
        public long CreationTime;
        public long LastAccessTime;
        public long LastWriteTime;
        public uint VolumeSerialNumber;
        public uint FileSizeHigh;
        public uint FileSizeLow;
        public uint NumberOfLinks;
        public uint FileIndexHigh;
        public uint FileIndexLow;
    }

    [LibraryImport("kernel32.dll", EntryPoint = "CreateFileW", SetLastError = true, StringMarshalling = StringMarshalling.Utf16)]
    private static partial SafeFileHandle CreateFile(string name, uint access, uint share, nint security, uint disposition, uint flags, nint template);

    [LibraryImport("kernel32.dll", EntryPoint = "GetFileInformationByHandle", SetLastError = true)]
    [return: MarshalAs(UnmanagedType.Bool)]
    private static partial bool GetFileInformationByHandle(SafeFileHandle handle, ByHandleFileInformation* information);

    [LibraryImport("kernel32.dll", EntryPoint = "GetFinalPathNameByHandleW", SetLastError = true)]
    private static partial uint GetFinalPathNameByHandle(SafeFileHandle handle, char* buffer, uint length, uint flags);

    internal static EntryStat StatNoFollow(string path)
    {
        using var handle = OpenForAttributes(path, FlagOpenReparsePoint, out var error);
        if (handle is null)
        {
            return EntryStat.Failed(error is ErrorFileNotFound or ErrorPathNotFound ? EntryKind.Missing : EntryKind.Inaccessible, Marshal.GetPInvokeErrorMessage(error));
        }

        if (!TryInformation(handle, out var information, out error))
        {
            return EntryStat.Failed(EntryKind.Inaccessible, Marshal.GetPInvokeErrorMessage(error));
        }

        var kind = (information.FileAttributes & AttributeReparsePoint) != 0 ? EntryKind.Link
            : (information.FileAttributes & AttributeDirectory) != 0 ? EntryKind.Directory
            : EntryKind.RegularFile;
        return new EntryStat(kind, ToFileStat(information), null);
    }

    internal static FileStat StatHandle(SafeFileHandle handle) =>
        TryInformation(handle, out var information, out var error)
            ? ToFileStat(information)
            : throw new IOException(Marshal.GetPInvokeErrorMessage(error));

    /// <summary>The path with every link, junction and mount point resolved, or null with the reason.</summary>
    internal static string? RealPath(string path, out string? problem)
    {
        using var handle = OpenForAttributes(path, 0, out var error);
        if (handle is null)
        {
            problem = Marshal.GetPInvokeErrorMessage(error);
            return null;
        }

        var buffer = new char[1024];
        while (true)
        {
            uint length;
            fixed (char* pointer = buffer)
            {
                length = GetFinalPathNameByHandle(handle, pointer, (uint)buffer.Length, 0);
            }

            if (length == 0)
            {
                problem = Marshal.GetPInvokeErrorMessage(Marshal.GetLastPInvokeError());
                return null;
            }

            if (length < buffer.Length)
            {
                problem = null;
                return StripVerbatimPrefix(new string(buffer, 0, (int)length));
            }

            buffer = new char[length + 1];
        }
    }

    private static SafeFileHandle? OpenForAttributes(string path, uint extraFlags, out int error)
    {
        var handle = CreateFile(Verbatim(path), FileReadAttributes, FileShareAll, 0, OpenExisting, FlagBackupSemantics | extraFlags, 0);
        error = Marshal.GetLastPInvokeError();
        if (handle.IsInvalid)
        {
            handle.Dispose();
            return null;
        }

        return handle;
    }

    private static bool TryInformation(SafeFileHandle handle, out ByHandleFileInformation information, out int error)
    {
        ByHandleFileInformation result;
        var ok = GetFileInformationByHandle(handle, &result);
        error = ok ? 0 : Marshal.GetLastPInvokeError();
        information = result;
        return ok;
    }

    private static FileStat ToFileStat(in ByHandleFileInformation information) => new(
        ((long)information.FileSizeHigh << 32) | information.FileSizeLow,
        DateTime.FromFileTimeUtc(information.LastWriteTime).Ticks,
        new FileIdentity(information.VolumeSerialNumber, ((ulong)information.FileIndexHigh << 32) | information.FileIndexLow));

    // Raw Win32 calls get no automatic long-path handling; the \\?\ form lifts the 260-character limit.
    private static string Verbatim(string path)
    {
        var full = Path.GetFullPath(path);
        if (full.StartsWith(@"\\?\", StringComparison.Ordinal))
        {
            return full;
        }

        return full.StartsWith(@"\\", StringComparison.Ordinal) ? @"\\?\UNC\" + full[2..] : @"\\?\" + full;
    }

    private static string StripVerbatimPrefix(string path) =>
        path.StartsWith(@"\\?\UNC\", StringComparison.Ordinal) ? @"\\" + path[8..]
        : path.StartsWith(@"\\?\", StringComparison.Ordinal) ? path[4..]
        : path;
}
