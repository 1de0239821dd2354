using IndexKeeper.Core.Encoding.PageImages;
using IndexKeeper.Service.Configuration;
using IndexKeeper.Service.Hosting;
using IndexKeeper.Tests.Support;
using Microsoft.Extensions.Configuration;

namespace IndexKeeper.Tests.Encoding.PageImages;

/// <summary>The page-image encoder as the service sees it: its settings bound from JSON, validated at start by name, and built by the factory.</summary>
public sealed class PageImageConfigurationTests(PageImageModels models) : IClassFixture<PageImageModels>
{
    [Fact]
    public void The_service_knows_page_image()
    {
        Assert.Contains("page-image", IndexKeeperOptionsValidator.EncoderNames);
        Assert.Empty(IndexKeeperOptionsValidator.Validate(Options()));
    }

    [Fact]
    public void Every_bad_page_image_setting_is_named_at_start()
    {
        var options = Options();
        var page = options.Encoder.PageImage;
        page.Pdftoppm = "/nonexistent/pdftoppm";
        page.QueryModel = string.Empty;
        page.QueryVocabulary = Path.Combine(models.Folder, "no-vocab.txt");
        page.InputWidth = 100;
        page.PixelMean = [0.5, 0.5, 0.5, 0.5];
        page.PixelStd = [0.5, 0, 0.5];
        page.Fit = "crop";
        page.RenderDpi = 5;

        var errors = IndexKeeperOptionsValidator.Validate(options);

        string[] named =
        [
            "Encoder:PageImage:Pdftoppm:", "Encoder:PageImage:QueryModel:", "Encoder:PageImage:QueryVocabulary:", "Encoder:PageImage:InputWidth:",
            "Encoder:PageImage:PixelMean:", "Encoder:PageImage:PixelStd:", "Encoder:PageImage:Fit:", "Encoder:PageImage:RenderDpi:",
        ];
        Assert.Equal(named.Length, errors.Count);
        Assert.All(named, prefix => Assert.Contains(errors, e => e.StartsWith(prefix, StringComparison.Ordinal)));
    }

    [Fact]
    public void Settings_shared_with_other_encoders_are_named_once_under_Encoder()
    {
        var options = Options();
        options.Encoder.Dimensions = 100;

        var errors = IndexKeeperOptionsValidator.Validate(options);

        Assert.Equal(["Encoder:Dimensions"], errors.Select(e => e[..e.IndexOf(": ", StringComparison.Ordinal)]));
    }

    [Fact]
    public void Json_settings_bind_strictly_and_the_factory_builds_the_encoder()
    {
        using var folder = new Documents.TempFolder();
        var json = $$"""
            {
              "IndexDirectory": "{{folder.PathOf("index")}}",
              "Roots": [ { "Name": "scans", "Path": "{{folder.PathOf("scans")}}" } ],
              "Encoder": {
                "Name": "page-image",
                "PageImage": {
                  "PageModel": "{{models.PageModel}}", "PageInput": "pixels", "PageOutput": "patch_vectors",
                  "InputWidth": 128, "InputHeight": 160, "PatchSize": 32,
                  "PixelMean": [ 0.48, 0.46, 0.41 ], "PixelStd": [ 0.27, 0.26, 0.28 ],
                  "QueryModel": "{{models.QueryModel}}", "QueryInput": "token_ids", "QueryOutput": "token_vectors",
                  "QueryVocabulary": "{{models.VocabularyFile}}"
                }
              }
            }
            """;
        var file = folder.Write("indexkeeper.json", System.Text.Encoding.UTF8.GetBytes(json));

        var options = OptionsLoader.Load(new ConfigurationSources(file, null, [], []));
        using var encoder = (IDisposable)EncoderFactory.Create(options.Encoder);

        Assert.Equal(new[] { 0.48, 0.46, 0.41 }, options.Encoder.PageImage.PixelMean);
        Assert.Equal("page-image", ((Core.Encoding.IPageEncoder)encoder).Identity.Name);
    }

    [Fact]
    public void The_sample_configuration_block_binds_strictly_when_uncommented()
    {
        var lines = File.ReadAllLines(Path.Combine(RepositoryRoot.Path, "config", "indexkeeper.sample.json"));
        var start = Array.FindIndex(lines, l => l.Trim() == "// ,\"PageImage\": {");
        Assert.True(start > 0, "the commented page-image block is in the sample's Encoder section");
        var block = lines.Skip(start).TakeWhile(l => l.TrimStart().StartsWith("//", StringComparison.Ordinal)).Select(l => l.TrimStart()[2..]);
        var json = "{ \"Encoder\": { \"Name\": \"page-image\", \"Dimensions\": 128" + string.Join("\n", block) + " } }";
        using var stream = new MemoryStream(System.Text.Encoding.UTF8.GetBytes(json));

        var options = new ConfigurationBuilder().AddJsonStream(stream).Build().Get<IndexKeeperOptions>(o => o.ErrorOnUnknownConfiguration = true)!;

        Assert.Equal("page-image", options.Encoder.Name);
        Assert.Equal(new[] { 0.5, 0.5, 0.5 }, options.Encoder.PageImage.PixelStd);
        Assert.Equal("/var/lib/indexkeeper/models/vocab.txt", options.Encoder.PageImage.QueryVocabulary);
    }

    [Fact]
    public void A_pdftoppm_that_does_not_answer_stops_the_factory_with_the_setting_named()
    {
        var options = Options();
        options.Encoder.PageImage.Pdftoppm = "true";

        var error = Assert.Throws<ConfigurationException>(() => EncoderFactory.Create(options.Encoder));

        Assert.StartsWith("Encoder:PageImage:Pdftoppm: 'true' cannot be used to draw pages", Assert.Single(error.Problems), StringComparison.Ordinal);
    }

    private IndexKeeperOptions Options() => new()
    {
        IndexDirectory = "/srv/harrowmere/index",
        Roots = [new RootOptions { Name = "scans", Path = "/srv/harrowmere/scans" }],
        Encoder = new EncoderOptions
        {
            Name = "page-image",
            PageImage = new PageImageModelOptions
            {
                PageModel = models.PageModel,
                PageInput = PageImageModels.PageInput,
                PageOutput = PageImageModels.PageOutput,
                InputWidth = PageImageModels.Width,
                InputHeight = PageImageModels.Height,
                PatchSize = PageImageModels.Patch,
                PixelMean = [0.48, 0.46, 0.41],
                PixelStd = [0.27, 0.26, 0.28],
                QueryModel = models.QueryModel,
                QueryInput = PageImageModels.QueryInput,
                QueryOutput = PageImageModels.QueryOutput,
                QueryVocabulary = models.VocabularyFile,
            },
        },
    };
}
