using System.Runtime.InteropServices;

namespace IndexKeeper.Core.Detect;

/// <summary>
/// A folder held by its descriptor. Entries are looked at and child folders opened relative to it (statx
/// and openat on the descriptor), so no path component above is looked up again, and a folder renamed to a
/// link mid-walk cannot lead the walk out of the root.
/// </summary>
internal sealed unsafe class LinuxFolder : IOpenFolder
{
    private readonly nint directory;
    private readonly int fd;

    private LinuxFolder(nint directory, string fullPath)
    {
        this.directory = directory;
        fd = LinuxNative.DirFd(directory);
        FullPath = fullPath;
        var names = new List<string>();
        while (true)
        {
            var entry = LinuxNative.ReadDir64(directory);
            if (entry is null)
            {
                var errorNumber = Marshal.GetLastPInvokeError();
                ListingError = errorNumber == 0 ? null : LinuxNative.Describe(errorNumber);
                break;
            }

            var name = MemoryMarshal.CreateReadOnlySpanFromNullTerminated(entry + LinuxNative.DirentNameOffset);
            if (name.SequenceEqual("."u8) || name.SequenceEqual(".."u8))
            {
                continue;
            }

            names.Add(LinuxPathCodec.Decode(name));
        }

        Names = names;
    }

    public string FullPath { get; }

    public IReadOnlyList<string> Names { get; }

    public string? ListingError { get; }

    /// <summary>Takes ownership of <paramref name="openFd"/> (closed on failure too).</summary>
    public static LinuxFolder? Adopt(int openFd, string fullPath, out EntryStat failure)
    {
        var directory = LinuxNative.FdOpenDir(openFd);
        if (directory == 0)
        {
            var errorNumber = Marshal.GetLastPInvokeError();
            LinuxNative.Close(openFd);
            failure = EntryStat.Failed(LinuxNative.KindOfError(errorNumber), LinuxNative.Describe(errorNumber));
            return null;
        }

        failure = default;
        return new LinuxFolder(directory, fullPath);
    }

    /// <summary>openat with the flags every Linux architecture agrees on; retried on EINTR.</summary>
    public static int OpenAt(int directoryFd, byte[] terminatedName, out int errorNumber)
    {
        int result;
        do
        {
            fixed (byte* name = terminatedName)
            {
                result = LinuxNative.OpenAt(directoryFd, name, LinuxNative.OpenReadOnly | LinuxNative.OpenNonBlock | LinuxNative.OpenCloseOnExec);
            }

            errorNumber = result < 0 ? Marshal.GetLastPInvokeError() : 0;
        }
        while (result < 0 && errorNumber == LinuxNative.EINTR);

        return result;
    }

    public EntryStat Stat(string name) => FileStatReader.ReadLinux(fd, LinuxPathCodec.EncodeTerminated(name));

    public IOpenFolder? OpenChild(string name, FileIdentity expected, out EntryStat failure)
    {
        var childFd = OpenAt(fd, LinuxPathCodec.EncodeTerminated(name), out var errorNumber);
        if (childFd < 0)
        {
            failure = EntryStat.Failed(LinuxNative.KindOfError(errorNumber), LinuxNative.Describe(errorNumber));
            return null;
        }

        var opened = FileStatReader.ReadLinux(childFd, [0], LinuxNative.AtEmptyPath);
        if (opened.Kind != EntryKind.Directory || opened.Stat.Identity != expected)
        {
            LinuxNative.Close(childFd);
            failure = EntryStat.Failed(EntryKind.Missing, "replaced by another entry while being opened");
            return null;
        }

        return Adopt(childFd, FullPath == "/" ? "/" + name : FullPath + "/" + name, out failure);
    }

    public void Dispose() => LinuxNative.CloseDir(directory);
}
