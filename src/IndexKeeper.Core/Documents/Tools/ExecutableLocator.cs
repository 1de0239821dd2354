namespace IndexKeeper.Core.Documents.Tools;

/// <summary>Finds an external program as the shell would: a path as given, a bare name on PATH.</summary>
internal static class ExecutableLocator
{
    /// <summary>The full path of the program, or null when there is none (or it is not executable).</summary>
    public static string? Find(string program)
    {
        ArgumentNullException.ThrowIfNull(program);
        if (program.Contains(Path.DirectorySeparatorChar) || program.Contains(Path.AltDirectorySeparatorChar))
        {
            return IsExecutable(program) ? Path.GetFullPath(program) : null;
        }

        var suffixes = OperatingSystem.IsWindows() && !Path.HasExtension(program) ? new[] { ".exe", string.Empty } : [string.Empty];
        var folders = (Environment.GetEnvironmentVariable("PATH") ?? string.Empty).Split(Path.PathSeparator, StringSplitOptions.RemoveEmptyEntries);
        foreach (var folder in folders)
        {
            foreach (var suffix in suffixes)
            {
                var candidate = Path.Combine(folder, program + suffix);
                if (IsExecutable(candidate))
                {
                    return Path.GetFullPath(candidate);
                }
            }
        }

        return null;
    }

    private static bool IsExecutable(string path)
    {
        if (!File.Exists(path))
        {
            return false;
        }

        if (OperatingSystem.IsWindows())
        {
            return true;
        }

        const UnixFileMode anyExecute = UnixFileMode.UserExecute | UnixFileMode.GroupExecute | UnixFileMode.OtherExecute;
        return (File.GetUnixFileMode(path) & anyExecute) != 0;
    }
}
