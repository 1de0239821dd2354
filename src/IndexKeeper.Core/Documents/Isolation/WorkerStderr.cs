using Microsoft.Extensions.Logging;

namespace IndexKeeper.Core.Documents.Isolation;

/// <summary>
/// Drains a worker's stderr: logs its lines and keeps the first few of the current read for the message of
/// a crash. Bounded in memory whatever the worker writes (a stack overflow prints thousands of frames).
/// </summary>
internal sealed class WorkerStderr
{
    private const int KeptLines = 6;
    private const int LoggedLines = 100;
    private const int MaxLineLength = 2000;

    private readonly int processId;
    private readonly ILogger logger;
    private readonly Lock gate = new();
    private readonly List<string> kept = [];
    private readonly Task pump;
    private int logged;

    public WorkerStderr(TextReader source, int processId, ILogger logger)
    {
        this.processId = processId;
        this.logger = logger;
        pump = Task.Run(() => PumpAsync(source));
    }

    /// <summary>Starts a new read: the kept lines and the log budget start over.</summary>
    public void BeginRead()
    {
        lock (gate)
        {
            kept.Clear();
            logged = 0;
        }
    }

    /// <summary>The first lines written since <see cref="BeginRead"/> (or since start), joined for a message.</summary>
    public string Excerpt()
    {
        lock (gate)
        {
            return string.Join(" | ", kept);
        }
    }

    /// <summary>Waits until the worker closed its stderr, so a crash's last words are in.</summary>
    public bool WaitForEnd(TimeSpan timeout) => pump.Wait(timeout);

    private async Task PumpAsync(TextReader source)
    {
        var buffer = new char[4096];
        var line = new System.Text.StringBuilder();
        try
        {
            int read;
            while ((read = await source.ReadAsync(buffer).ConfigureAwait(false)) > 0)
            {
                foreach (var c in buffer.AsSpan(0, read))
                {
                    if (c == '\n')
                    {
                        Add(line.ToString().TrimEnd('\r'));
                        line.Clear();
                    }
                    else if (line.Length < MaxLineLength)
                    {
                        line.Append(c);
                    }
                }
            }
        }
        catch (Exception e) when (e is IOException or ObjectDisposedException)
        {
            // The pipe went away with the process; what was read is all there is.
        }

        if (line.Length > 0)
        {
            Add(line.ToString());
        }
    }

    private void Add(string line)
    {
        if (line.Length == 0)
        {
            return;
        }

        bool log;
        bool suppressedNow;
        lock (gate)
        {
            if (kept.Count < KeptLines)
            {
                kept.Add(line);
            }

            log = logged < LoggedLines;
            suppressedNow = logged == LoggedLines;
            logged++;
        }

        if (log)
        {
            WorkerLog.StderrLine(logger, processId, line);
        }
        else if (suppressedNow)
        {
            WorkerLog.StderrSuppressed(logger, processId);
        }
    }
}
