using IndexKeeper.Service.Configuration;
using Microsoft.Extensions.Logging;

namespace IndexKeeper.Service.WorkQueue;

/// <summary>Hosts <see cref="RemoteWorker"/> for <c>indexkeeper worker</c>: one log line per event on stderr (as <c>run</c> writes them), exit 0 after a stop request.</summary>
public static class WorkerHost
{
    /// <param name="untilIdle">Return at the first claim that finds no job.</param>
    public static int Run(IndexKeeperOptions options, bool untilIdle, CancellationToken stopping)
    {
        ArgumentNullException.ThrowIfNull(options);
        using var logging = LoggerFactory.Create(b => b
            .SetMinimumLevel(LogLevel.Information)
            .AddSimpleConsole(o =>
            {
                o.SingleLine = true;
                o.UseUtcTimestamp = true;
                o.TimestampFormat = "yyyy-MM-ddTHH:mm:ssZ ";
            })
            .AddConsole(o => o.LogToStandardErrorThreshold = LogLevel.Trace));
        using var worker = new RemoteWorker(options, logging.CreateLogger("IndexKeeper.Worker"));
        worker.Run(untilIdle, stopping);
        return 0;
    }
}
