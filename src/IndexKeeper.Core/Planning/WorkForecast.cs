namespace IndexKeeper.Core.Planning;

/// <summary>
/// When queued work would be done under the gate. A null instant means never within the horizon
/// (e.g. migration work with no window at all).
/// </summary>
/// <param name="FreshDone">When the last fresh page is embedded.</param>
/// <param name="MigrationDone">When the last migration page is embedded.</param>
/// <param name="CanaryDone">When the last canary page is embedded.</param>
/// <param name="AllDone">When every page is embedded: the latest of the three.</param>
/// <param name="EncoderSeconds">Encoder time all the work takes, wherever it falls.</param>
public sealed record WorkForecast(
    DateTimeOffset? FreshDone,
    DateTimeOffset? MigrationDone,
    DateTimeOffset? CanaryDone,
    DateTimeOffset? AllDone,
    double EncoderSeconds);
