using System.Diagnostics;
using IndexKeeper.Service.Configuration;
using IndexKeeper.Service.Daemon;

namespace IndexKeeper.Cli.Commands;

/// <summary>
/// Read-only commands ask a daemon that runs on the index for the report (its maps and encoder are warm),
/// and otherwise read the index themselves, beside any writer (docs/catalog.md, "Readers beside a writer").
/// A daemon that does not answer (a stale endpoint file after a kill) costs a note, not the answer.
/// </summary>
internal static class ThroughDaemon
{
    public static T Ask<T>(IndexKeeperOptions options, Func<T> direct, Func<DaemonClient, T> viaDaemon)
    {
        var endpoint = DaemonEndpoint.Read(Path.GetFullPath(options.IndexDirectory));
        if (endpoint is null || !Alive(endpoint.ProcessId))
        {
            return direct();
        }

        using (var daemon = DaemonClient.ForIndex(options))
        {
            if (daemon is not null)
            {
                try
                {
                    Console.Error.WriteLine($"indexkeeper: the daemon runs on this index; asking it at {daemon.Url}");
                    return viaDaemon(daemon);
                }
                catch (IOException ex)
                {
                    Console.Error.WriteLine($"indexkeeper: {ex.Message}; reading the index directly");
                }
            }
        }

        return direct();
    }

    private static bool Alive(int processId)
    {
        try
        {
            using var process = Process.GetProcessById(processId);
            return !process.HasExited;
        }
        catch (ArgumentException)
        {
            return false;
        }
    }
}
