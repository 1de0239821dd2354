namespace IndexKeeper.Service.Configuration;

/// <summary>
/// The shared work queue in PostgreSQL (docs/work-queue.md): with <see cref="Connection"/> set, <c>run</c>
/// publishes pages to embed as jobs and commits what <c>worker</c> processes hand back; unset, everything
/// runs in one process.
/// </summary>
public sealed class QueueOptions
{
    /// <summary>
    /// An Npgsql connection string (Host, Port, Database, Username, …) without a password: the password comes
    /// from <see cref="PasswordFile"/> or from the file <c>PGPASSFILE</c> names, so it is never in a setting or a log.
    /// </summary>
    public string? Connection { get; set; }

    /// <summary>A file whose first line is the PostgreSQL password (readable by the service account only).</summary>
    public string? PasswordFile { get; set; }

    /// <summary>How long a claimed job is a worker's; a worker that neither finishes nor renews it by then loses it to another.</summary>
    public double LeaseSeconds { get; set; } = 120;

    /// <summary>What <c>run</c> does while PostgreSQL cannot be reached: <c>local</c> (embed here, as without a queue) or <c>wait</c>.</summary>
    public string WhenUnreachable { get; set; } = "local";

    /// <summary>Jobs published and not yet committed, at most: the gate decides what is published when, so little waits ahead of it.</summary>
    public int PublishAhead { get; set; } = 256;

    /// <summary>Jobs a worker claims at once (one encoder call).</summary>
    public int ClaimBatch { get; set; } = 8;

    /// <summary>Seconds between a worker's heartbeats; a worker silent for three of them is no longer counted as live.</summary>
    public double HeartbeatSeconds { get; set; } = 10;

    /// <summary>The longest wait between two attempts to reach PostgreSQL again (the wait doubles from one second up to it).</summary>
    public double ReconnectMaxSeconds { get; set; } = 60;

    /// <summary>A worker's name in status and metrics; default the host name and process id.</summary>
    public string? WorkerName { get; set; }
}
