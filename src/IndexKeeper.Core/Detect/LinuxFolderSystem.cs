using System.Runtime.InteropServices;

namespace IndexKeeper.Core.Detect;

/// <summary>Linux walks: raw-byte names, descriptor-relative lookups, glibc realpath for links.</summary>
internal sealed unsafe class LinuxFolderSystem : IFolderSystem
{
    public StringComparison PathComparison => StringComparison.Ordinal;

    public char Separator => '/';

    public IOpenFolder? OpenRoot(string path, out WalkProblemKind failureKind, out string detail)
    {
        var real = Resolve(path, out var resolveError);
        if (real is null)
        {
            failureKind = LinuxNative.KindOfError(resolveError) == EntryKind.Missing ? WalkProblemKind.RootMissing : WalkProblemKind.RootInaccessible;
            detail = LinuxNative.Describe(resolveError);
            return null;
        }

        failureKind = WalkProblemKind.RootInaccessible;
        var fd = LinuxFolder.OpenAt(LinuxNative.AtFdCwd, LinuxPathCodec.EncodeTerminated(real), out var errorNumber);
        if (fd < 0)
        {
            failureKind = errorNumber is LinuxNative.ENOENT ? WalkProblemKind.RootMissing : WalkProblemKind.RootInaccessible;
            detail = LinuxNative.Describe(errorNumber);
            return null;
        }

        if (FileStatReader.ReadLinux(fd, [0], LinuxNative.AtEmptyPath).Kind != EntryKind.Directory)
        {
            LinuxNative.Close(fd);
            detail = "not a folder";
            return null;
        }

        var folder = LinuxFolder.Adopt(fd, real, out var failure);
        detail = failure.Error ?? string.Empty;
        return folder;
    }

    public string? RealPath(string fullPath, out WalkProblemKind failureKind, out string detail)
    {
        var real = Resolve(fullPath, out var errorNumber);
        failureKind = errorNumber is LinuxNative.ENOENT or LinuxNative.ENOTDIR or LinuxNative.ELOOP
            ? WalkProblemKind.BrokenLink
            : WalkProblemKind.Inaccessible;
        detail = real is null ? LinuxNative.Describe(errorNumber) : string.Empty;
        return real;
    }

    private static string? Resolve(string path, out int errorNumber)
    {
        var bytes = LinuxPathCodec.EncodeTerminated(path);
        byte* resolved;
        fixed (byte* pointer = bytes)
        {
            resolved = LinuxNative.RealPath(pointer, null);
        }

        if (resolved is null)
        {
            errorNumber = Marshal.GetLastPInvokeError();
            return null;
        }

        try
        {
            errorNumber = 0;
            return LinuxPathCodec.Decode(MemoryMarshal.CreateReadOnlySpanFromNullTerminated(resolved));
        }
        finally
        {
            LinuxNative.Free(resolved);
        }
    }

    // A UTF-16 unit never takes more than 3 bytes, so most paths are settled without encoding them.
    public bool IsTooLong(string fullPath) =>
        fullPath.Length * 3 >= LinuxNative.PathMax && LinuxPathCodec.EncodeTerminated(fullPath).Length > LinuxNative.PathMax;
}
