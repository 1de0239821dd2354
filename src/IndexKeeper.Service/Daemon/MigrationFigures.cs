namespace IndexKeeper.Service.Daemon;

/// <summary>
/// The serving encoder (whose vectors searches rank), the active one (what new vectors are made with) and,
/// while they differ or migration work waits, how far the move has come and when it should be done.
/// </summary>
/// <param name="PagesMoved">Pages that have a live vector set under the active encoder.</param>
/// <param name="Pages">Pages (distinct page keys) the documents show.</param>
/// <param name="ExpectedFinish">When the last migration page is expected to be embedded, through the windows and budget at the measured rate; null when there is no estimate (see <paramref name="NotInSight"/>).</param>
/// <param name="NotInSight">True when the work does not finish within the forecast's horizon (e.g. no window at all); false when only the rate is unknown.</param>
public sealed record MigrationFigures(
    string ServingEncoder,
    string ServingEncoderId,
    string ActiveEncoder,
    string ActiveEncoderId,
    long PagesMoved,
    long Pages,
    long PagesWaiting,
    DateTimeOffset? ExpectedFinish,
    bool NotInSight)
{
    public static MigrationFigures None { get; } = new(string.Empty, string.Empty, string.Empty, string.Empty, 0, 0, 0, null, false);

    public bool Running => PagesWaiting > 0;

    /// <summary>Share of pages moved to the active encoder: 1 when no migration runs.</summary>
    public double Progress => !Running || Pages == 0 ? 1 : Math.Clamp((double)PagesMoved / Pages, 0, 1);
}
