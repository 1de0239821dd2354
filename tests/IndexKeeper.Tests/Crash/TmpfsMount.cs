using System.Diagnostics;
using System.Globalization;

namespace IndexKeeper.Tests.Crash;

/// <summary>
/// A small tmpfs mounted over a folder (Linux, root only): a disk that really fills, with ENOSPC from
/// the kernel, for the full-disk tests. Unmounted on dispose.
/// </summary>
internal sealed class TmpfsMount : IDisposable
{
    private static readonly Lazy<bool> Works = new(Probe);

    private bool mounted = true;

    private TmpfsMount(string path) => Path = path;

    /// <summary>True when this process can mount a tmpfs here (root on Linux with the mount capability).</summary>
    public static bool Available => Works.Value;

    public string Path { get; }

    public static TmpfsMount Mount(string path, int kilobytes)
    {
        Directory.CreateDirectory(path);
        Run("mount", "-t", "tmpfs", "-o", Size(kilobytes), "tmpfs", path);
        return new TmpfsMount(path);
    }

    /// <summary>Changes the size in place; the files stay.</summary>
    public void Resize(int kilobytes) => Run("mount", "-o", "remount," + Size(kilobytes), Path);

    public void Dispose()
    {
        if (mounted)
        {
            mounted = false;
            Run("umount", Path);
        }
    }

    private static string Size(int kilobytes) => "size=" + kilobytes.ToString(CultureInfo.InvariantCulture) + "k";

    private static bool Probe()
    {
        if (!OperatingSystem.IsLinux() || !Environment.IsPrivilegedProcess)
        {
            return false;
        }

        var path = System.IO.Path.Combine(System.IO.Path.GetTempPath(), "ik-tmpfs-probe-" + Guid.NewGuid().ToString("N")[..12]);
        try
        {
            using (Mount(path, 64))
            {
                return true;
            }
        }
        catch (Exception error) when (error is InvalidOperationException or System.ComponentModel.Win32Exception)
        {
            return false;
        }
        finally
        {
            Directory.Delete(path);
        }
    }

    private static void Run(string command, params string[] args)
    {
        var start = new ProcessStartInfo(command) { RedirectStandardError = true, RedirectStandardOutput = true, UseShellExecute = false };
        foreach (var arg in args)
        {
            start.ArgumentList.Add(arg);
        }

        using var process = Process.Start(start) ?? throw new InvalidOperationException(command + " did not start");
        var error = process.StandardError.ReadToEnd();
        process.WaitForExit();
        if (process.ExitCode != 0)
        {
            throw new InvalidOperationException($"{command} {string.Join(' ', args)} failed ({process.ExitCode}): {error}");
        }
    }
}
