using IndexKeeper.Core.Health;

namespace IndexKeeper.Service.Daemon;

/// <summary>What only a running daemon knows (<c>/api/daemon</c>): roots, walks, rates, the gate, health, the chart's samples, quarantined pages.</summary>
public sealed class DaemonReport
{
    public DateTimeOffset Started { get; init; }

    public DateTimeOffset? LastFullWalk { get; init; }

    public double PagesPerSecond { get; init; }

    public long PagesEmbedded { get; init; }

    public long WatcherOverflows { get; init; }

    public bool WindowOpen { get; init; }

    public DateTimeOffset? WindowEnd { get; init; }

    /// <summary>When the next window opens (after the current one, if one is open); null when none opens within the calendar's horizon.</summary>
    public DateTimeOffset? NextWindowOpens { get; init; }

    /// <summary>The windows in force, as configured (docs/scheduling.md), and the zone they are read in.</summary>
    public IReadOnlyList<string> Windows { get; init; } = [];

    /// <summary>
    /// The zone windows are read in, as an IANA id where the system knows one (what browsers format times in);
    /// every time of this report carries that zone's offset.
    /// </summary>
    public string TimeZone { get; init; } = string.Empty;

    /// <summary>Serving and active encoder, and while a migration runs its progress and expected finish.</summary>
    public required MigrationFigures Migration { get; init; }

    public long QueuedFresh { get; init; }

    public long QueuedMigration { get; init; }

    public long QueuedCanary { get; init; }

    public required HealthReport Health { get; init; }

    public IReadOnlyList<RootState> Roots { get; init; } = [];

    public IReadOnlyList<QuarantinedPage> QuarantinedPages { get; init; } = [];

    public IReadOnlyList<Sample> Samples { get; init; } = [];

    /// <summary>The work queue and its workers (docs/work-queue.md); null without Queue:Connection.</summary>
    public WorkQueue.WorkQueueFigures? WorkQueue { get; init; }
}
