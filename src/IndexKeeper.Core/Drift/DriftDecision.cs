namespace IndexKeeper.Core.Drift;

/// <summary>What the drift policy decided for one moment of an index (see <see cref="DriftPolicy.Decide"/>).</summary>
/// <param name="ServingEncoderId">The encoder searches rank with once the decision is applied.</param>
/// <param name="RecordServing">The serving encoder must be written to the catalog (first record, or a switch-over).</param>
/// <param name="SwitchOver">The migration is complete: the active encoder becomes the serving one now.</param>
/// <param name="DriftedPages">Page keys whose live vectors are only under the serving encoder, not the active one (before a switch-over), ordinal order.</param>
/// <param name="QueueForMigration">Drifted page keys not yet queued: queue them at migration priority.</param>
/// <param name="MigratedPages">Page keys the serving encoder holds that already have active vectors.</param>
/// <param name="RetireEncoders">Encoders that are neither serving nor active (after the decision): their vector sets become dead.</param>
public sealed record DriftDecision(
    string ServingEncoderId,
    bool RecordServing,
    bool SwitchOver,
    IReadOnlyList<string> DriftedPages,
    IReadOnlyList<string> QueueForMigration,
    long MigratedPages,
    IReadOnlyList<string> RetireEncoders)
{
    /// <summary>Pages to migrate in all: migrated and still drifted.</summary>
    public long PagesToMigrate => MigratedPages + DriftedPages.Count;

    public bool Migrating => DriftedPages.Count > 0;
}
