using System.Security.Cryptography;
using IndexKeeper.Core.Encoding.PageImages;

namespace IndexKeeper.Tests.Encoding.PageImages;

/// <summary>The page-image encoder id changes when, and only when, one of the inputs of its vectors changes.</summary>
public sealed class PageImageIdentityTests(PageImageModels models) : IClassFixture<PageImageModels>
{
    private static readonly byte[] PageHash = SHA256.HashData([1]);
    private static readonly byte[] QueryHash = SHA256.HashData([2]);
    private static readonly byte[] VocabularyHash = SHA256.HashData([3]);
    private const string Renderer = "pdftoppm version 22.12.0";
    private const string Runtime = "1.31.1";

    [Fact]
    public void Every_input_of_the_vectors_changes_the_id()
    {
        var baseline = Id(Options());
        string[] variants =
        [
            Id(Options(), page: SHA256.HashData([9])),
            Id(Options(), query: SHA256.HashData([9])),
            Id(Options(), vocabulary: SHA256.HashData([9])),
            Id(Options(), renderer: "pdftoppm version 24.02.0"),
            Id(Options(), runtime: "1.31.2"),
            Id(Options(o => o.PageInput = "image")),
            Id(Options(o => o.PageOutput = "patches")),
            Id(Options(o => o.QueryInput = "ids")),
            Id(Options(o => o.QueryMaskInput = "attention_mask")),
            Id(Options(o => o.QueryOutput = "tokens")),
            Id(Options(o => o.InputWidth = 896)),
            Id(Options(o => o.InputHeight = 896)),
            Id(Options(o => o.PatchSize = 14)),
            Id(Options(o => o.Fit = PageImageFit.Stretch)),
            Id(Options(o => o.PixelMean = [0.5, 0.5, 0.50000001])),
            Id(Options(o => o.PixelStd = [0.5, 0.25, 0.5])),
            Id(Options(o => o.RenderDpi = 96)),
            Id(Options(o => o.QueryLowerCase = false)),
            Id(Options(o => o.QueryMaxTokens = 32)),
            Id(Options(o => o.Dimensions = 256)),
            Id(Options(o => o.PoolFactor = 2)),
        ];

        Assert.DoesNotContain(baseline, variants);
        Assert.Equal(variants.Length, variants.Distinct().Count());
    }

    [Fact]
    public void Settings_that_do_not_change_the_vectors_keep_the_id()
    {
        var baseline = Id(Options());

        // Where the files lie, which pdftoppm binary answers, threads and time limits do not change the floats.
        Assert.Equal(baseline, Id(Options(o => o.PageModel = "/opt/models/elsewhere.onnx")));
        Assert.Equal(baseline, Id(Options(o => o.Pdftoppm = "/usr/local/bin/pdftoppm")));
        Assert.Equal(baseline, Id(Options(o => o.IntraOpThreads = 2)));
        Assert.Equal(baseline, Id(Options(o => o.RenderTimeoutSeconds = 5)));
    }

    [Fact]
    public void The_id_is_the_sha256_of_the_description()
    {
        var identity = PageImageEncoderFactory.Identify(Options(), PageHash, QueryHash, VocabularyHash, Renderer, Runtime);

        Assert.Contains($"page-model-sha256={Convert.ToHexStringLower(PageHash)};", identity.Description, StringComparison.Ordinal);
        Assert.Contains("renderer=pdftoppm version 22.12.0;dpi=72;", identity.Description, StringComparison.Ordinal);
        Assert.Contains("onnxruntime=1.31.1;provider=CPU;", identity.Description, StringComparison.Ordinal);
        Assert.Contains("mean=0.48,0.46,0.41;std=0.27,0.26,0.28;", identity.Description, StringComparison.Ordinal);

        // The package versions pinned in Directory.Packages.props, not the assembly versions (ImageSharp's stays 2.0.0.0).
        Assert.Contains("images=skiasharp-3.119.0+imagesharp-2.1.13+over-white;", identity.Description, StringComparison.Ordinal);

        // FIPS 180-4 SHA-256 through the platform's implementation.
        Assert.Equal(Convert.ToHexStringLower(SHA256.HashData(System.Text.Encoding.UTF8.GetBytes(identity.Description))), identity.Id);
    }

    [Fact]
    public void Real_files_a_changed_weight_and_another_pdftoppm_version_change_the_id_a_moved_copy_does_not()
    {
        using var folder = new Documents.TempFolder();
        var options = models.Options();
        var moved = models.Options();
        moved.PageModel = folder.Write("moved.onnx", File.ReadAllBytes(models.PageModel));
        var changed = models.Options();
        var weights = (float[])models.Weights.Clone();
        weights[12345] += 0.001f;
        changed.PageModel = folder.Write("changed.onnx", OnnxModels.PatchGraph(
            PageImageModels.Width, PageImageModels.Height, PageImageModels.Patch, PageImageModels.Dimensions, weights, models.Bias, PageImageModels.PageInput, PageImageModels.PageOutput));

        using var real = (PageImageEncoder)PageImageEncoderFactory.Create(options);
        using var copy = (PageImageEncoder)PageImageEncoderFactory.Create(moved);
        using var other = (PageImageEncoder)PageImageEncoderFactory.Create(changed);
        using var olderPoppler = PageImageEncoderFactory.Create(options, new VersionOnlyRenderer("pdftoppm version 0.86.1"));

        Assert.Equal(real.Identity.Id, copy.Identity.Id);
        Assert.NotEqual(real.Identity.Id, other.Identity.Id);
        Assert.NotEqual(real.Identity.Id, olderPoppler.Identity.Id);
        Assert.Contains("renderer=pdftoppm version ", real.Identity.Description, StringComparison.Ordinal);
    }

    private static PageImageEncoderOptions Options(Action<PageImageEncoderOptions>? change = null)
    {
        var options = new PageImageEncoderOptions { PixelMean = [0.48, 0.46, 0.41], PixelStd = [0.27, 0.26, 0.28] };
        change?.Invoke(options);
        return options;
    }

    private static string Id(PageImageEncoderOptions options, byte[]? page = null, byte[]? query = null, byte[]? vocabulary = null, string renderer = Renderer, string runtime = Runtime) =>
        PageImageEncoderFactory.Identify(options, page ?? PageHash, query ?? QueryHash, vocabulary ?? VocabularyHash, renderer, runtime).Id;

    /// <summary>Reports a version and draws nothing: only the id is looked at.</summary>
    private sealed class VersionOnlyRenderer(string version) : IPdfRenderer
    {
        public string Version => version;

        public void Render(string path, int firstPage, int lastPage, int dpi, Action<int, RasterImage> onPage, CancellationToken cancellationToken) =>
            throw new InvalidOperationException("not drawn in this test");
    }
}
