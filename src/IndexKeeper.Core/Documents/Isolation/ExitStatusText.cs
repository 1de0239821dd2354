namespace IndexKeeper.Core.Documents.Isolation;

/// <summary>Describes how a worker process ended, for quarantine messages and logs.</summary>
internal static class ExitStatusText
{
    /// <summary>
    /// On Unix the runtime reports death by signal N as exit code 128 + N (common practice of shells,
    /// kept by .NET's process class); a runtime abort (stack overflow, fatal error) is SIGABRT, code 134.
    /// </summary>
    public static string Describe(int exitCode)
    {
        if (OperatingSystem.IsWindows() || exitCode <= 128 || exitCode > 128 + 64)
        {
            return $"exit code {exitCode}";
        }

        var signal = exitCode - 128;
        var name = signal switch
        {
            // Signal numbers of Linux on x86 and ARM (from memory; see signal(7)).
            6 => " SIGABRT",
            9 => " SIGKILL",
            11 => " SIGSEGV",
            15 => " SIGTERM",
            _ => string.Empty,
        };
        return $"exit code {exitCode}: signal {signal}{name}";
    }
}
