namespace IndexKeeper.Core.Catalog;

/// <summary>An encoder that produced vectors in this index (collection <c>encoders</c>).</summary>
public sealed class EncoderRecord
{
    /// <summary>The encoder id: hex fingerprint of everything that changes its vectors.</summary>
    public string Id { get; set; } = string.Empty;

    public string Name { get; set; } = string.Empty;

    public string Description { get; set; } = string.Empty;

    public int Dimensions { get; set; }

    public DateTime FirstUsedUtc { get; set; }

    /// <summary>
    /// The configuration that builds this encoder again (for query encoding while it serves a migrating
    /// index): setting name → invariant text, as the host wrote it. Empty for an encoder registered before
    /// settings were recorded.
    /// </summary>
    public Dictionary<string, string> Settings { get; set; } = [];

    /// <summary>Neither serving nor active any more: its vector sets are dead and compaction reclaims them.</summary>
    public bool Retired { get; set; }

    public DateTime? RetiredUtc { get; set; }

    /// <summary>When canaries were last checked against this encoder (null: never).</summary>
    public DateTime? CanaryCheckedUtc { get; set; }

    public int CanaryPages { get; set; }

    public long CanaryVectors { get; set; }

    public double CanaryMeanCosine { get; set; }

    public double CanaryMinimumCosine { get; set; }

    /// <summary>The last canary check found silent drift: fresh vectors no longer match the stored ones under this id.</summary>
    public bool CanaryDrifted { get; set; }
}
