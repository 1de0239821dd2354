using System.Runtime.InteropServices;

namespace IndexKeeper.Core.Storage;

/// <summary>
/// Lets go of the pages of a read-only file mapping this process holds resident. On Linux, madvise(2) with
/// MADV_DONTNEED on a shared file mapping only drops the process's page-table entries: the bytes stay in the
/// kernel's page cache and the next read maps them again (a minor fault), so nothing is lost and nothing is
/// written. Without it every segment page a build or a re-rank ever read counts in the daemon's resident
/// memory until the map is undone (docs/daemon.md, "Memory"). Elsewhere it does nothing: the system trims
/// a process's working set of file pages on its own.
/// </summary>
internal static unsafe partial class ResidentPages
{
    // madvise(2), Linux: MADV_DONTNEED is 4 (include/uapi/asm-generic/mman-common.h).
    private const int DontNeed = 4;

    /// <summary>REQUIRES: <paramref name="start"/> is the page-aligned start of a live read-only file mapping of <paramref name="length"/> bytes.</summary>
    public static void Drop(byte* start, long length)
    {
        if (!OperatingSystem.IsLinux() || start is null || length <= 0)
        {
            return;
        }

        // A refusal (EINVAL, EAGAIN) leaves the pages resident, which only costs memory: not worth failing a read for.
        _ = Madvise(start, (nuint)length, DontNeed);
    }

    /// <summary>
    /// Bytes of mapped files (and shared memory) resident in this process: the third field of /proc/self/statm
    /// (proc(5)) times the page size; 0 where there is no such file.
    /// </summary>
    public static long FileBytes()
    {
        if (!OperatingSystem.IsLinux())
        {
            return 0;
        }

        try
        {
            var fields = File.ReadAllText("/proc/self/statm").Split(' ');
            return fields.Length > 2 && long.TryParse(fields[2], System.Globalization.CultureInfo.InvariantCulture, out var pages) ? pages * Environment.SystemPageSize : 0;
        }
        catch (IOException)
        {
            return 0;
        }
    }

    [LibraryImport("libc", EntryPoint = "madvise", SetLastError = true)]
    private static partial int Madvise(byte* address, nuint length, int advice);
}
