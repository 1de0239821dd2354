using IndexKeeper.Core.Encoding;
using IndexKeeper.Service.Configuration;
using IndexKeeper.Service.Application;
using IndexKeeper.Service.Hosting;

namespace IndexKeeper.Service.Querying;

/// <summary>
/// Which encoder ranks a query (docs/encoders.md, "Search during a migration"): the serving encoder, so
/// a migration in progress never mixes vectors of two encoders and pages not yet migrated stay found.
/// While the active encoder is another one, the serving encoder is built again from the settings the
/// catalog recorded; if that build does not give the same id (the model or runtime changed under it),
/// the active encoder ranks the pages already migrated, and <see cref="Notice"/> says so.
/// </summary>
internal sealed class RankingEncoder : IDisposable
{
    private readonly IPageEncoder? owned;

    private RankingEncoder(IPageEncoder encoder, IPageEncoder? owned, string servingEncoderId, string? notice)
    {
        Encoder = encoder;
        this.owned = owned;
        ServingEncoderId = servingEncoderId;
        Notice = notice;
    }

    public IPageEncoder Encoder { get; }

    public string ServingEncoderId { get; }

    public string? Notice { get; }

    /// <param name="current">The active encoder's settings; a rebuilt serving encoder takes what its record lacks from them.</param>
    public static RankingEncoder Choose(OpenIndex index, EncoderOptions current, DriftOperation drift)
    {
        var active = index.Encoder;
        // A catalog that never recorded one (made before drift tracking) gets the policy's inference.
        var serving = index.Catalog.Encoders.ServingId() ?? drift.Read().ServingEncoderId;
        if (serving == active.Identity.Id)
        {
            return new RankingEncoder(active, null, serving, null);
        }

        var record = index.Catalog.Encoders.Find(serving);
        var why = "the catalog does not know it";
        // A record made before settings were recorded: its name and d with no pooling are the likely
        // settings, and the id check below makes a wrong guess harmless.
        var recorded = record is { Settings.Count: 0 }
            ? new Dictionary<string, string>
            {
                [nameof(EncoderOptions.Name)] = record.Name,
                [nameof(EncoderOptions.Dimensions)] = record.Dimensions.ToString(System.Globalization.CultureInfo.InvariantCulture),
                [nameof(EncoderOptions.PoolFactor)] = "1",
            }
            : record?.Settings;
        if (recorded is not null && EncoderSettings.Rebuild(recorded, current) is { } options)
        {
            IPageEncoder? rebuilt = null;
            try
            {
                rebuilt = EncoderFactory.Create(options);
                if (rebuilt.Identity.Id == serving)
                {
                    return new RankingEncoder(rebuilt, rebuilt, serving, null);
                }

                why = $"its recorded settings now build encoder id {rebuilt.Identity.Id[..12]}";
            }
            catch (Exception ex) when (ex is ConfigurationException or ArgumentException or InvalidOperationException)
            {
                why = $"it cannot be built: {ex.Message}";
            }

            (rebuilt as IDisposable)?.Dispose();
        }

        var migrated = index.Catalog.VectorSets.LivePageKeysOf(active.Identity.Id).Count;
        return new RankingEncoder(
            active,
            null,
            serving,
            $"The index is migrating from encoder {record?.Name ?? "?"} {serving[..12]} to {active.Identity.Name} {active.Identity.Id[..12]}, and the serving encoder cannot be used here ({why}); " +
            $"ranked only the {migrated} page(s) already migrated, with the active encoder. Run sync to finish the migration.");
    }

    public void Dispose() => (owned as IDisposable)?.Dispose();
}
