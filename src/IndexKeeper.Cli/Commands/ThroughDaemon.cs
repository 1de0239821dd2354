using IndexKeeper.Core.Catalog;
using IndexKeeper.Service.Configuration;
using IndexKeeper.Service.Daemon;

namespace IndexKeeper.Cli.Commands;

/// <summary>
/// Read-only commands open the index themselves, and when the daemon holds it, ask the daemon's API for
/// the same report instead: two processes never open one index, and the operator still gets an answer.
/// </summary>
internal static class ThroughDaemon
{
    public static T Ask<T>(IndexKeeperOptions options, Func<T> direct, Func<DaemonClient, T> viaDaemon)
    {
        try
        {
            return direct();
        }
        catch (IndexLockedException ex) when (ex.HolderPurpose == DaemonClient.LockPurpose)
        {
            using var daemon = DaemonClient.ForIndex(options);
            if (daemon is null)
            {
                // A daemon that has not written its endpoint yet (still starting): say who holds the index.
                throw;
            }

            Console.Error.WriteLine($"indexkeeper: the daemon holds the index; asking it at {daemon.Url}");
            return viaDaemon(daemon);
        }
    }
}
