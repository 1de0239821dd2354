using StringBuilder = System.Text.StringBuilder;


namespace IndexKeeper.Core.Detect;

/// <summary>
/// Which file system a root lies on, so a root on a network share can be polled: a server does not tell a
/// client about changes made by its other clients, so change notifications miss them (SMB and NFS alike).
/// Linux: the mount whose mount point is the longest prefix of the path in <c>/proc/self/mountinfo</c>
/// (format in the kernel's Documentation/filesystems/proc.rst, "/proc/&lt;pid&gt;/mountinfo"). Windows: the
/// drive type, or a UNC path.
/// </summary>
public static class MountTable
{
    /// <summary>
    /// File-system types that are network shares: the kernel's NFS and SMB clients, and other shared or
    /// remote file systems a team's drive is mounted with (common practice).
    /// </summary>
    public static IReadOnlySet<string> NetworkTypes { get; } = new HashSet<string>(StringComparer.Ordinal)
    {
        "nfs", "nfs4", "cifs", "smb3", "smbfs", "9p", "ceph", "glusterfs", "fuse.glusterfs", "fuse.sshfs", "afs", "lustre", "davfs", "fuse.rclone",
    };

    /// <summary>The type of the file system holding <paramref name="path"/> ("network" on a Windows network drive); null when unknown.</summary>
    public static string? FileSystemTypeOf(string path)
    {
        ArgumentNullException.ThrowIfNull(path);
        if (OperatingSystem.IsWindows())
        {
            if (path.StartsWith(@"\\", StringComparison.Ordinal))
            {
                return "network";
            }

            try
            {
                var drive = new DriveInfo(Path.GetPathRoot(Path.GetFullPath(path)) ?? path);
                return drive.DriveType == DriveType.Network ? "network" : drive.DriveFormat;
            }
            catch (Exception ex) when (ex is IOException or ArgumentException or UnauthorizedAccessException)
            {
                return null;
            }
        }

        if (!OperatingSystem.IsLinux())
        {
            return null;
        }

        try
        {
            return FileSystemTypeOf(Path.GetFullPath(path), File.ReadLines("/proc/self/mountinfo"));
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            return null;
        }
    }

    /// <summary>Whether a file-system type from <see cref="FileSystemTypeOf(string)"/> is a network share.</summary>
    public static bool IsNetwork(string? type) => type is not null && (type == "network" || NetworkTypes.Contains(type));

    /// <summary>The type of the mount with the longest mount point that holds <paramref name="fullPath"/>, from mountinfo lines.</summary>
    internal static string? FileSystemTypeOf(string fullPath, IEnumerable<string> mountInfoLines)
    {
        string? best = null;
        var bestLength = -1;
        foreach (var line in mountInfoLines)
        {
            // id parent major:minor root mount-point options [optional fields...] - type source super-options
            var fields = line.Split(' ');
            var separator = Array.IndexOf(fields, "-", 6);
            if (fields.Length < 7 || separator < 0 || separator + 1 >= fields.Length)
            {
                continue;
            }

            var mountPoint = Unescape(fields[4]);
            if (mountPoint.Length > bestLength && Holds(mountPoint, fullPath))
            {
                best = fields[separator + 1];
                bestLength = mountPoint.Length;
            }
        }

        return best;
    }

    private static bool Holds(string mountPoint, string fullPath) =>
        mountPoint == "/" ||
        fullPath == mountPoint ||
        (fullPath.StartsWith(mountPoint, StringComparison.Ordinal) && fullPath[mountPoint.Length] == '/');

    /// <summary>mountinfo writes space, tab, newline and backslash in paths as a backslash and three octal digits.</summary>
    private static string Unescape(string field)
    {
        if (!field.Contains('\\', StringComparison.Ordinal))
        {
            return field;
        }

        var text = new StringBuilder(field.Length);
        for (var i = 0; i < field.Length; i++)
        {
            if (field[i] == '\\' && i + 3 < field.Length && IsOctal(field[i + 1]) && IsOctal(field[i + 2]) && IsOctal(field[i + 3]))
            {
                text.Append((char)(((field[i + 1] - '0') * 64) + ((field[i + 2] - '0') * 8) + (field[i + 3] - '0')));
                i += 3;
            }
            else
            {
                text.Append(field[i]);
            }
        }

        return text.ToString();
    }

    private static bool IsOctal(char c) => c is >= '0' and <= '7';
}
