namespace IndexKeeper.Service.Hosting;

/// <summary>Every encoder id in an index with its counts, role and drift state: what <c>encoders --json</c> prints.</summary>
public sealed class EncodersReport
{
    public string ActiveEncoderId { get; init; } = string.Empty;

    public string ServingEncoderId { get; init; } = string.Empty;

    /// <summary>A migration from the serving to the active encoder is in progress.</summary>
    public bool Migrating { get; init; }

    public long PagesDrifted { get; init; }

    public long PagesMigrated { get; init; }

    /// <summary>The last canary check ran now (<c>--check-canaries</c>) and is in <see cref="Encoders"/>.</summary>
    public bool CanariesCheckedNow { get; init; }

    public IReadOnlyList<EncoderReportEntry> Encoders { get; init; } = [];
}
