namespace IndexKeeper.Core.Drift;

/// <summary>
/// What the drift policy looks at, read from the catalog: the configured (active) encoder, the encoder the
/// index serves searches from, and which page keys have a live vector set under each known encoder.
/// </summary>
/// <param name="ActiveEncoderId">The id of the configured encoder.</param>
/// <param name="ServingEncoderId">The recorded serving encoder; null in a catalog that never recorded one.</param>
/// <param name="LivePagesByEncoder">Every encoder the catalog knows (retired ones included), with the page keys it has live vector sets for.</param>
/// <param name="Queued">Page keys already in the queue (at any priority).</param>
/// <param name="RetiredEncoders">Encoders already retired: their vector sets are dead.</param>
public sealed record DriftFacts(
    string ActiveEncoderId,
    string? ServingEncoderId,
    IReadOnlyDictionary<string, IReadOnlySet<string>> LivePagesByEncoder,
    IReadOnlySet<string> Queued,
    IReadOnlySet<string> RetiredEncoders);
