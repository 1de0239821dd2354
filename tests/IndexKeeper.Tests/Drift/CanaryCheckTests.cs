using IndexKeeper.Core.Drift;
using IndexKeeper.Service.Application;
using IndexKeeper.Core.Pipeline;

namespace IndexKeeper.Tests.Drift;

/// <summary>
/// Canary checks on a real index: the encoder that made the stored vectors finds no drift (float16 storage
/// allowed for); an encoder claiming the same id but adding noise is caught, with its figures recorded on the
/// encoder's catalog record.
/// </summary>
public sealed class CanaryCheckTests : IDisposable
{
    private readonly DriftIndex index = new();

    [Fact]
    public void The_unchanged_encoder_reports_no_drift_and_the_figures_are_recorded()
    {
        using var session = Indexed();
        var figures = CanaryCheck.Run(session.Index.Catalog, session.Index.Store, session.Index.Words, session.Index.Encoder, session.Settings.RootPaths, new CanarySettings(4), Now, CancellationToken.None);

        Assert.False(figures.Drifted);
        Assert.Equal(4, figures.Pages);
        Assert.True(figures.MinimumCosine > 0.9999, $"minimum {figures.MinimumCosine}");
        var record = session.Index.Catalog.Encoders.Find(session.Index.Encoder.Identity.Id)!;
        Assert.Equal(Now, record.CanaryCheckedUtc!.Value.ToUniversalTime());
        Assert.False(record.CanaryDrifted);
        Assert.Equal(figures.MeanCosine, record.CanaryMeanCosine);
    }

    [Fact]
    public void An_encoder_claiming_the_same_id_with_other_numbers_is_silent_drift_with_its_figures()
    {
        using var session = Indexed();
        var noisy = new NoisyEncoder(session.Index.Encoder, noise: 0.05, seed: 11);
        var figures = CanaryCheck.Run(session.Index.Catalog, session.Index.Store, session.Index.Words, noisy, session.Settings.RootPaths, new CanarySettings(4), Now, CancellationToken.None);

        Assert.True(figures.Drifted);
        Assert.True(figures.MeanCosine < 0.999, $"mean {figures.MeanCosine}");
        Assert.True(figures.MinimumCosine < figures.MeanCosine);
        Assert.True(figures.Vectors > 4);
        var record = session.Index.Catalog.Encoders.Find(session.Index.Encoder.Identity.Id)!;
        Assert.True(record.CanaryDrifted);
        Assert.Equal(figures.MinimumCosine, record.CanaryMinimumCosine);
    }

    [Fact]
    public void The_canaries_are_the_lowest_page_keys()
    {
        using var session = Indexed();
        var live = session.Index.Catalog.VectorSets.LivePageKeysOf(session.Index.Encoder.Identity.Id);
        Assert.Equal(live.Order(StringComparer.Ordinal).Take(2), CanarySelection.Choose(live, 2));
        Assert.Equal(2, CanaryCheck.Run(session.Index.Catalog, session.Index.Store, session.Index.Words, session.Index.Encoder, session.Settings.RootPaths, new CanarySettings(2), Now, CancellationToken.None).Pages);
    }

    public void Dispose() => index.Dispose();

    private static readonly DateTime Now = new(2031, 3, 14, 8, 0, 0, DateTimeKind.Utc);

    private IndexComposition Indexed()
    {
        var session = index.Open(128);
        DriftIndex.AddDocument(
            session.Index.Catalog,
            "manuals/pumps.pdf",
            "pump station maintenance schedule",
            "valve exercise record for the north main",
            "turbidity alarm response at Wyke End",
            "storm overflow log for Harrowmere",
            "chlorine contact tank cleaning");
        DriftIndex.Embed(session);
        session.Get<DriftOperation>().Reconcile();
        return session;
    }
}
