namespace IndexKeeper.Tests.Isolation;

/// <summary>Asks the Linux process table (proc(5)) whether a process still runs.</summary>
internal static class ProcessProbe
{
    /// <summary>Waits a bounded while for the process to end; a zombie counts as ended. A guard, not a timing check.</summary>
    public static bool Ends(int processId)
    {
        for (var attempt = 0; attempt < 300; attempt++)
        {
            if (!Runs(processId))
            {
                return true;
            }

            Thread.Sleep(100);
        }

        return false;
    }

    public static bool Runs(int processId)
    {
        try
        {
            // Field 3 of /proc/PID/stat is the state; "Z" is a zombie, which no longer runs.
            var stat = File.ReadAllText($"/proc/{processId}/stat");
            var state = stat[(stat.LastIndexOf(')') + 2)..].Split(' ')[0];
            return state != "Z";
        }
        catch (Exception e) when (e is FileNotFoundException or DirectoryNotFoundException or IOException)
        {
            return false;
        }
    }
}
