using IndexKeeper.Core.Documents;
using IndexKeeper.Service.Application;
using IndexKeeper.Service.Configuration;

namespace IndexKeeper.Tests.Configuration;

/// <summary>The Readers section: its checks, and how it reaches the reader worker's settings.</summary>
public sealed class ReaderSettingsTests
{
    [Fact]
    public void The_readers_section_reaches_the_worker_and_the_ocr_cache_lives_in_the_index()
    {
        var options = OptionsLoader.Load(new ConfigurationSources(
            ConfigFile: null,
            IndexDirectory: "/srv/kellmarsh/index",
            Roots: ["/srv/kellmarsh/shared-drive"],
            Overrides: ["Readers:OcrLanguages:0=deu", "Readers:OcrLanguages:1=eng", "Readers:ConversionTimeoutSeconds=90", "Readers:MaxEmailAttachments=10"]));

        var settings = IndexSettings.From(options).Reader.ReaderSettings;

        // The configured list replaces the default instead of being appended to it.
        Assert.Equal(["deu", "eng"], settings.OcrLanguages);
        Assert.Equal(TimeSpan.FromSeconds(90), settings.ConversionTimeout);
        Assert.Equal(10, settings.MaxParts);
        Assert.Equal(Path.Combine("/srv/kellmarsh/index", "ocr-cache"), settings.OcrCacheDirectory);
    }

    [Fact]
    public void The_defaults_are_the_readers_own()
    {
        var settings = IndexSettings.From(Valid(_ => { })).Reader.ReaderSettings;
        Assert.Equal(ReaderSettings.Default with { OcrCacheDirectory = settings.OcrCacheDirectory, OcrLanguages = settings.OcrLanguages }, settings);
        Assert.Equal(ReaderSettings.Default.OcrLanguages, settings.OcrLanguages);
    }

    [Fact]
    public void Every_bad_reader_setting_is_named()
    {
        var errors = IndexKeeperOptionsValidator.Validate(Valid(o => o.Readers = new ReaderOptions
        {
            OcrLanguages = ["eng+deu", "chi_sim", "script/Latin", "../../etc"],
            OfficeConverter = " ",
            OcrProgram = string.Empty,
            OcrPageTimeoutSeconds = 0,
            ConversionTimeoutSeconds = double.NaN,
            ConversionMemoryMegabytes = 16,
            MaxEmailNesting = -1,
            MaxEmailAttachments = 1_000_000,
        }));

        Assert.Equal(
            [
                "Readers:ConversionMemoryMegabytes", "Readers:ConversionTimeoutSeconds", "Readers:MaxEmailAttachments", "Readers:MaxEmailNesting",
                "Readers:OcrLanguages:0", "Readers:OcrLanguages:3", "Readers:OcrPageTimeoutSeconds", "Readers:OcrProgram", "Readers:OfficeConverter",
            ],
            errors.Select(e => e[..e.IndexOf(": ", StringComparison.Ordinal)]).Order(StringComparer.Ordinal));
    }

    private static IndexKeeperOptions Valid(Action<IndexKeeperOptions> change)
    {
        var options = new IndexKeeperOptions
        {
            IndexDirectory = "/srv/kellmarsh/index",
            Roots = [new RootOptions { Name = "shared-drive", Path = "/srv/kellmarsh/shared-drive" }],
        };
        change(options);
        return options;
    }
}
