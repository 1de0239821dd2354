namespace IndexKeeper.Core.Index;

/// <summary>What <see cref="DamageSurvey"/> found: the damaged or missing segment files and the totals status and health show.</summary>
public sealed class DamageReport
{
    public IReadOnlyList<SegmentDamage> Segments { get; init; } = [];

    /// <summary>Segment files the catalog names that are not there.</summary>
    public int SegmentsMissing { get; init; }

    /// <summary>Live vector sets whose bytes cannot be read (their pages cannot be found by search).</summary>
    public int VectorSetsUnreadable { get; init; }

    /// <summary>Pages a live document holds that have no readable live vector set under the serving encoder (queued ones included).</summary>
    public int PagesWithoutVectors { get; init; }

    /// <summary>Of <see cref="PagesWithoutVectors"/>, those not queued: nothing will give them vectors until a repair queues them.</summary>
    public int PagesWithoutVectorsNotQueued { get; init; }

    public bool Clean => Segments.Count == 0;
}
