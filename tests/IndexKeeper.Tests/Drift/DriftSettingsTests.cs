using IndexKeeper.Core.Encoding.PageImages;
using IndexKeeper.Service.Configuration;
using IndexKeeper.Service.Hosting;

namespace IndexKeeper.Tests.Drift;

/// <summary>The Drift settings section and the encoder settings recorded with each encoder id.</summary>
public sealed class DriftSettingsTests
{
    [Fact]
    public void Bad_drift_settings_are_all_named()
    {
        var options = Options();
        options.Drift = new DriftOptions { CanaryPages = -1, CanaryMinimumMeanCosine = 1.5, CanaryMinimumCosine = double.NaN, CanaryIntervalHours = 0 };
        var errors = IndexKeeperOptionsValidator.Validate(options);
        Assert.Contains(errors, e => e.StartsWith("Drift:CanaryPages:", StringComparison.Ordinal));
        Assert.Contains(errors, e => e.StartsWith("Drift:CanaryMinimumMeanCosine:", StringComparison.Ordinal));
        Assert.Contains(errors, e => e.StartsWith("Drift:CanaryMinimumCosine:", StringComparison.Ordinal));
        Assert.Contains(errors, e => e.StartsWith("Drift:CanaryIntervalHours:", StringComparison.Ordinal));

        options.Drift = new DriftOptions { CanaryMinimumMeanCosine = 0.9, CanaryMinimumCosine = 0.95 };
        Assert.Contains(IndexKeeperOptionsValidator.Validate(options), e => e.StartsWith("Drift:CanaryMinimumCosine:", StringComparison.Ordinal));
        Assert.Empty(IndexKeeperOptionsValidator.Validate(Options()));
    }

    [Fact]
    public void The_recorded_settings_build_the_same_encoder_id_again()
    {
        var configured = new EncoderOptions { Name = "hashed-terms", Dimensions = 192, PoolFactor = 2, BatchSize = 7 };
        var rebuilt = EncoderSettings.Rebuild(EncoderSettings.Record(configured), new EncoderOptions { Name = "minilm", IntraOpThreads = 2 })!;
        Assert.Equal(EncoderFactory.Create(configured).Identity.Id, EncoderFactory.Create(rebuilt).Identity.Id);
        Assert.Equal(2, rebuilt.IntraOpThreads);
        Assert.Null(EncoderSettings.Rebuild(new Dictionary<string, string> { ["Name"] = "hashed-terms" }, new EncoderOptions()));

        // The page-image settings travel whole: the recorded model, not the one configured now, is rebuilt.
        var image = new EncoderOptions { Name = "page-image", PageImage = new PageImageModelOptions { PageModel = "/srv/models/pages-v1.onnx", PixelMean = [0.5, 0.5, 0.5], RenderDpi = 96 } };
        var rebuiltImage = EncoderSettings.Rebuild(EncoderSettings.Record(image), new EncoderOptions { PageImage = new PageImageModelOptions { PageModel = "/srv/models/pages-v2.onnx" } })!;
        Assert.Equal("/srv/models/pages-v1.onnx", rebuiltImage.PageImage.PageModel);
        Assert.Equal([0.5, 0.5, 0.5], rebuiltImage.PageImage.PixelMean);
        Assert.Equal(96, rebuiltImage.PageImage.RenderDpi);
        var withoutImage = EncoderSettings.Record(image).Where(p => p.Key != nameof(EncoderOptions.PageImage)).ToDictionary();
        Assert.Null(EncoderSettings.Rebuild(withoutImage, new EncoderOptions()));
    }

    /// <summary>A setting added to <see cref="EncoderOptions"/> must be recorded if it changes the vectors, or listed here if it does not.</summary>
    [Fact]
    public void Every_encoder_setting_that_changes_vectors_is_recorded_and_only_those_change_the_id()
    {
        string[] notInId = [nameof(EncoderOptions.BatchSize), nameof(EncoderOptions.IntraOpThreads)];
        var recorded = EncoderSettings.Record(new EncoderOptions()).Keys;
        var all = typeof(EncoderOptions).GetProperties().Select(p => p.Name);
        Assert.Equal(all.Order(), recorded.Concat(notInId).Order());

        var baseline = Id(new EncoderOptions { Name = "hashed-terms" });
        Assert.Equal(baseline, Id(new EncoderOptions { Name = "hashed-terms", BatchSize = 3, IntraOpThreads = 2 }));
        Assert.NotEqual(baseline, Id(new EncoderOptions { Name = "hashed-terms", Dimensions = 64 }));
        Assert.NotEqual(baseline, Id(new EncoderOptions { Name = "hashed-terms", PoolFactor = 2 }));
    }

    private static string Id(EncoderOptions options) => EncoderFactory.Create(options).Identity.Id;

    private static IndexKeeperOptions Options() => new()
    {
        IndexDirectory = "/srv/harrowmere/index",
        Roots = [new RootOptions { Name = "shared-drive", Path = "/srv/harrowmere/shared-drive" }],
    };
}
