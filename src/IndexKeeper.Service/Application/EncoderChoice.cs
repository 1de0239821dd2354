using IndexKeeper.Core.Catalog;
using IndexKeeper.Service.Configuration;
using IndexKeeper.Service.Hosting;

namespace IndexKeeper.Service.Application;

/// <summary>
/// The index remembers its encoder (docs/encoders.md, "Which encoder a command uses"): settings that change
/// the vectors (<c>Name</c>, <c>Dimensions</c>, <c>PoolFactor</c>, <c>PageImage</c> as a whole) that the
/// configuration does not give are taken from the index's active encoder, as the catalog recorded them; a
/// new index takes the defaults. So a migration starts only when a setting names another encoder, never
/// because a command was run without one.
/// </summary>
public static class EncoderChoice
{
    public static EncoderOptions Resolve(EncoderOptions configured, IndexCatalog catalog)
    {
        ArgumentNullException.ThrowIfNull(configured);
        ArgumentNullException.ThrowIfNull(catalog);
        if (configured.Given is not { } given || ActiveRecord(catalog) is not { } active)
        {
            return configured;
        }

        // Another encoder named outright: its own defaults, nothing of the old one's settings.
        if (given.Contains(nameof(EncoderOptions.Name)) && configured.Name != active.Name)
        {
            return configured;
        }

        if (EncoderSettings.Rebuild(active.Settings, configured) is not { } recorded)
        {
            return configured;
        }

        return new EncoderOptions
        {
            Name = recorded.Name,
            Dimensions = given.Contains(nameof(EncoderOptions.Dimensions)) ? configured.Dimensions : recorded.Dimensions,
            PoolFactor = given.Contains(nameof(EncoderOptions.PoolFactor)) ? configured.PoolFactor : recorded.PoolFactor,
            PageImage = given.Contains(nameof(EncoderOptions.PageImage)) ? configured.PageImage : recorded.PageImage,
            BatchSize = configured.BatchSize,
            IntraOpThreads = configured.IntraOpThreads,
            Given = given,
        };
    }

    /// <summary>
    /// The encoder the index was last set to use. Every writing command records the encoder it was given and
    /// retires all but that one and the serving one (DriftReconciler), so of the encoders in use the active
    /// one is the one that does not serve, or the serving one when there is no migration. Null for a new
    /// index, or one whose records cannot tell (then the configuration decides, as before).
    /// </summary>
    private static EncoderRecord? ActiveRecord(IndexCatalog catalog)
    {
        var inUse = catalog.Encoders.All().Where(e => !e.Retired && e.Settings.Count > 0).ToList();
        var serving = catalog.Encoders.ServingId();
        return inUse.Count switch
        {
            1 => inUse[0],
            2 when inUse.Count(e => e.Id == serving) == 1 => inUse.Single(e => e.Id != serving),
            _ => null,
        };
    }
}
