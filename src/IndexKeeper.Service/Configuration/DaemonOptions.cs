namespace IndexKeeper.Service.Configuration;

/// <summary>Settings of <c>indexkeeper run</c>: the HTTP endpoint, its token, shutdown, logs, telemetry and health limits.</summary>
public sealed class DaemonOptions
{
    /// <summary>HOST:PORT of the HTTP API; loopback by default. Any other address needs a token.</summary>
    public string Listen { get; set; } = "127.0.0.1:7717";

    /// <summary>Bearer token (prefer <see cref="TokenFile"/> or the environment variable INDEXKEEPER_Daemon__Token).</summary>
    public string? Token { get; set; }

    /// <summary>A file whose first line is the bearer token (readable by the service account only).</summary>
    public string? TokenFile { get; set; }

    /// <summary>
    /// Open HTTP connections at most; one past it is closed as soon as it is accepted, before any request is
    /// read. Metrics scrapers, the status page and commands need a few.
    /// </summary>
    public int MaxConnections { get; set; } = 100;

    /// <summary>A connection with no request in flight (before its first or between two) is closed after this long.</summary>
    public double IdleTimeoutSeconds { get; set; } = 30;

    /// <summary>Time a stop request (SIGTERM, service stop, Ctrl+C) has to finish the batch in flight and seal.</summary>
    public double ShutdownGraceSeconds { get; set; } = 30;

    /// <summary>
    /// <c>auto</c> (systemd's format when stderr goes to the journal, else text), <c>text</c>, <c>json</c> (one JSON
    /// object per line) or <c>systemd</c> (a syslog priority prefix per line, which journald reads as the level). All on stderr.
    /// </summary>
    public string LogFormat { get; set; } = "auto";

    /// <summary>
    /// OTLP endpoint for metrics and traces: the collector's base URL (e.g. http://127.0.0.1:4317 for gRPC,
    /// http://127.0.0.1:4318 for http/protobuf, which gets /v1/metrics and /v1/traces appended). Empty: the standard
    /// OTEL_EXPORTER_OTLP_* variables decide, and without them nothing is exported.
    /// </summary>
    public string? OtlpEndpoint { get; set; }

    /// <summary>OTLP transport for <see cref="OtlpEndpoint"/>: <c>grpc</c> or <c>http/protobuf</c> (the OTLP specification's names).</summary>
    public string OtlpProtocol { get; set; } = "grpc";

    /// <summary>
    /// At start, after the warm-up search, read the serving encoder's segment files once so the page cache holds them
    /// and the first searches after a reboot do not wait on the disk; only when they fit in a quarter of the memory.
    /// </summary>
    public bool ReadAheadSegments { get; set; } = true;

    /// <summary>Seconds between samples of the figures (metrics, status page chart, health).</summary>
    public double SampleSeconds { get; set; } = 10;

    /// <summary>Minutes between compaction checks (the policy decides whether anything is due).</summary>
    public double CompactEveryMinutes { get; set; } = 30;

    /// <summary>A page whose encoder attempt failed this many times is quarantined with its reason.</summary>
    public int MaxAttempts { get; set; } = 5;

    /// <summary>First retry delay after a failed encoder attempt; each further failure doubles it (capped at one hour).</summary>
    public double RetryBaseSeconds { get; set; } = 30;

    /// <summary>
    /// The work loop retries a turn that failed on an I/O fault (disk full, too many open files) this many
    /// times, waiting <see cref="FaultRetryBaseSeconds"/> first and twice as long each time (at most five
    /// minutes); a fault that outlasts them, or any other fault, ends the process with exit code 1 so the
    /// service manager starts it afresh.
    /// </summary>
    public int FaultRetries { get; set; } = 20;

    /// <summary>The work loop's first wait after a failed turn.</summary>
    public double FaultRetryBaseSeconds { get; set; } = 1;

    /// <summary>Health: a search that failed less than this long ago is reported (unhealthy unless one has succeeded since).</summary>
    public double HealthSearchFailureMinutes { get; set; } = 15;

    /// <summary>Health: a dead share of segment bytes above this is reported.</summary>
    public double HealthDeadRatio { get; set; } = 0.5;

    /// <summary>Health: free space on the index volume below this share is degraded; below half of it unhealthy.</summary>
    public double HealthMinFreeShare { get; set; } = 0.1;
}
