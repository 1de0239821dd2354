namespace IndexKeeper.Service.Hosting;

/// <summary>One encoder id of an index, as <c>encoders --json</c> lists it.</summary>
public sealed class EncoderReportEntry
{
    public string Id { get; init; } = string.Empty;

    public string Name { get; init; } = string.Empty;

    /// <summary>The canonical description the id is the SHA-256 of.</summary>
    public string Description { get; init; } = string.Empty;

    public int Dimensions { get; init; }

    public long LiveVectorSets { get; init; }

    public long VectorSets { get; init; }

    /// <summary>The configured encoder.</summary>
    public bool Active { get; init; }

    /// <summary>The encoder searches rank with.</summary>
    public bool Serving { get; init; }

    /// <summary>Neither active nor serving: its vector sets are dead.</summary>
    public bool Retired { get; init; }

    /// <summary>For the active encoder while it is not serving: pages migrated to it so far.</summary>
    public long? PagesMigrated { get; init; }

    /// <summary>... of this many pages the serving encoder holds.</summary>
    public long? PagesToMigrate { get; init; }

    /// <summary>For the serving encoder while another is active: its pages not yet migrated (drifted, queued).</summary>
    public long? PagesDrifted { get; init; }

    public DateTime FirstUsedUtc { get; init; }

    public CanaryReport? Canary { get; init; }
}
