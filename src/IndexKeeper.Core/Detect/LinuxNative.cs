using System.Runtime.InteropServices;

namespace IndexKeeper.Core.Detect;

/// <summary>
/// The few glibc calls the Linux walk and hasher need. Paths travel as raw bytes (see
/// <see cref="LinuxPathCodec"/>) because .NET's own file APIs turn bytes that are not UTF-8 into U+FFFD
/// and then cannot open the file. Only calls with an arch-independent ABI are used: statx (glibc 2.28+)
/// has one struct layout on every architecture, dirent64 likewise; open flags are limited to the ones
/// whose values are the same on every Linux architecture .NET runs on.
/// </summary>
internal static unsafe partial class LinuxNative
{
    private const string Libc = "libc";

    internal const int AtFdCwd = -100;
    internal const int AtSymlinkNoFollow = 0x100;
    internal const int AtEmptyPath = 0x1000;

    // statx mask bits (linux/stat.h).
    internal const uint StatxType = 0x1;
    internal const uint StatxMtime = 0x40;
    internal const uint StatxIno = 0x100;
    internal const uint StatxSize = 0x200;
    internal const uint StatxWanted = StatxType | StatxMtime | StatxIno | StatxSize;

    // Same value on x86, x64, arm, arm64, riscv64, ppc64le, s390x, loongarch64 (asm-generic/fcntl.h).
    // O_NOFOLLOW and O_DIRECTORY are not: they differ on arm/ppc, so callers compare identities instead.
    internal const int OpenReadOnly = 0;
    internal const int OpenNonBlock = 0x800;
    internal const int OpenCloseOnExec = 0x80000;

    // File type bits of st_mode (sys/stat.h; POSIX values, the same everywhere).
    internal const int ModeTypeMask = 0xF000;
    internal const int ModeRegular = 0x8000;
    internal const int ModeDirectory = 0x4000;
    internal const int ModeLink = 0xA000;

    // errno values (asm-generic/errno-base.h; identical on the architectures above).
    internal const int ENOENT = 2;
    internal const int EINTR = 4;
    internal const int EACCES = 13;
    internal const int ENOTDIR = 20;
    internal const int ENAMETOOLONG = 36;
    internal const int ELOOP = 40;

    /// <summary>PATH_MAX including the terminating NUL: longer paths cannot be opened by name.</summary>
    internal const int PathMax = 4096;

    [StructLayout(LayoutKind.Explicit, Size = 256)]
    internal struct Statx
    {
        [FieldOffset(0)] public uint Mask;
        [FieldOffset(28)] public ushort Mode;
        [FieldOffset(32)] public ulong Inode;
        [FieldOffset(40)] public ulong Size;
        [FieldOffset(112)] public long ModifiedSeconds;
        [FieldOffset(120)] public uint ModifiedNanoseconds;
        [FieldOffset(136)] public uint DeviceMajor;
        [FieldOffset(140)] public uint DeviceMinor;
    }

    [LibraryImport(Libc, EntryPoint = "statx", SetLastError = true)]
    internal static partial int StatX(int directoryFd, byte* path, int flags, uint mask, Statx* buffer);

    [LibraryImport(Libc, EntryPoint = "openat", SetLastError = true)]
    internal static partial int OpenAt(int directoryFd, byte* path, int flags);

    [LibraryImport(Libc, EntryPoint = "close", SetLastError = true)]
    internal static partial int Close(int fd);

    [LibraryImport(Libc, EntryPoint = "fdopendir", SetLastError = true)]
    internal static partial nint FdOpenDir(int fd);

    [LibraryImport(Libc, EntryPoint = "readdir64", SetLastError = true)]
    internal static partial byte* ReadDir64(nint directory);

    [LibraryImport(Libc, EntryPoint = "closedir", SetLastError = true)]
    internal static partial int CloseDir(nint directory);

    [LibraryImport(Libc, EntryPoint = "dirfd", SetLastError = true)]
    internal static partial int DirFd(nint directory);

    [LibraryImport(Libc, EntryPoint = "realpath", SetLastError = true)]
    internal static partial byte* RealPath(byte* path, byte* resolved);

    [LibraryImport(Libc, EntryPoint = "free")]
    internal static partial void Free(void* pointer);

    [LibraryImport(Libc, EntryPoint = "strerror")]
    private static partial byte* StrError(int errorNumber);

    /// <summary>struct dirent64: d_ino u64, d_off i64, d_reclen u16, d_type u8, then d_name.</summary>
    internal const int DirentNameOffset = 19;

    internal static string Describe(int errorNumber)
    {
        var text = Marshal.PtrToStringUTF8((nint)StrError(errorNumber));
        return $"{text} (errno {errorNumber})";
    }

    /// <summary>glibc's makedev: the same number `stat -c %d` prints.</summary>
    internal static ulong MakeDevice(uint major, uint minor) =>
        ((ulong)(major & 0xFFFFF000u) << 32) | ((ulong)(major & 0xFFFu) << 8)
        | ((ulong)(minor & 0xFFFFFF00u) << 12) | (minor & 0xFFu);

    internal static EntryKind KindOf(ushort mode) => (mode & ModeTypeMask) switch
    {
        ModeRegular => EntryKind.RegularFile,
        ModeDirectory => EntryKind.Directory,
        ModeLink => EntryKind.Link,
        _ => EntryKind.Other,
    };

    internal static FileStat ToFileStat(in Statx buffer)
    {
        // 100 ns ticks hold what FileStat keeps; nanoseconds below that are dropped on purpose.
        var ticks = DateTime.UnixEpoch.Ticks + (buffer.ModifiedSeconds * TimeSpan.TicksPerSecond) + (buffer.ModifiedNanoseconds / 100);
        return new FileStat((long)buffer.Size, ticks, new FileIdentity(MakeDevice(buffer.DeviceMajor, buffer.DeviceMinor), buffer.Inode));
    }

    internal static EntryKind KindOfError(int errorNumber) =>
        errorNumber is ENOENT or ENOTDIR ? EntryKind.Missing : EntryKind.Inaccessible;
}
