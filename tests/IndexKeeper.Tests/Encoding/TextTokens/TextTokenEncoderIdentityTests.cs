using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Encoding.TextTokens;
using IndexKeeper.Core.Storage;

namespace IndexKeeper.Tests.Encoding.TextTokens;

public sealed class TextTokenEncoderIdentityTests
{
    private static readonly byte[] Model = [1, 2, 3];
    private static readonly byte[] Vocabulary = [4, 5, 6];

    [Fact]
    public void Every_input_of_the_vectors_changes_the_id()
    {
        var baseline = Id(new TextTokenEncoderOptions());
        string[] variants =
        [
            Id(new TextTokenEncoderOptions { Dimensions = 256 }),
            Id(new TextTokenEncoderOptions { ProjectionSeed = 2 }),
            Id(new TextTokenEncoderOptions { MaxSequenceLength = 128 }),
            Id(new TextTokenEncoderOptions { WindowOverlap = 16 }),
            Id(new TextTokenEncoderOptions { PoolFactor = 2 }),
            Id(new TextTokenEncoderOptions(), model: [1, 2, 4]),
            Id(new TextTokenEncoderOptions(), vocabulary: [4, 5, 7]),
            Id(new TextTokenEncoderOptions(), runtime: "1.31.2"),
            Id(new TextTokenEncoderOptions(), tokenizer: "2.0.1"),
        ];
        Assert.DoesNotContain(baseline, variants);
        Assert.Equal(variants.Length, variants.Distinct().Count());
    }

    [Fact]
    public void Settings_that_do_not_change_the_vectors_keep_the_id()
    {
        var baseline = Id(new TextTokenEncoderOptions());
        Assert.Equal(baseline, Id(new TextTokenEncoderOptions()));
        Assert.Equal(baseline, Id(new TextTokenEncoderOptions { IntraOpThreads = 2 }));
        Assert.Equal(baseline, Id(new TextTokenEncoderOptions { IntraOpThreads = 0, MaxWindowsPerRun = 1 }));
    }

    [Fact]
    public void The_id_is_the_sha256_of_the_description()
    {
        var identity = TextTokenEncoderFactory.Identify(new TextTokenEncoderOptions(), Hash(Model), Hash(Vocabulary), "1.31.1", "2.0.0");
        Assert.Contains("dimensions=128;", identity.Description, StringComparison.Ordinal);
        Assert.Contains("seed=1;", identity.Description, StringComparison.Ordinal);
        Assert.Contains("max-sequence=256;window=254;overlap=32;", identity.Description, StringComparison.Ordinal);
        Assert.Contains("provider=CPU", identity.Description, StringComparison.Ordinal);
        Assert.Contains("tokenizer-library=2.0.0;", identity.Description, StringComparison.Ordinal);
        Assert.Contains("pooling=" + VectorPooling.Scheme + ";", identity.Description, StringComparison.Ordinal);

        // The stored element types: float16 (IEEE 754 binary16) rows and sign-bit codes, as segments keep them.
        Assert.EndsWith(";stored=" + VectorQuantization.StoredForm, identity.Description, StringComparison.Ordinal);

        // FIPS 180-4 SHA-256 through the platform's implementation.
        Assert.Equal(Convert.ToHexStringLower(Hash(System.Text.Encoding.UTF8.GetBytes(identity.Description))), identity.Id);
    }

    [Fact]
    public void Bad_settings_are_all_reported()
    {
        var errors = new TextTokenEncoderOptions { Dimensions = 448, MaxSequenceLength = 600, WindowOverlap = -1, PoolFactor = 0, IntraOpThreads = -1, MaxWindowsPerRun = 0 }.Validate();
        Assert.Equal(6, errors.Count);
        Assert.Contains(errors, e => e.StartsWith("Dimensions", StringComparison.Ordinal));
        Assert.Empty(new TextTokenEncoderOptions().Validate());
    }

    private static string Id(TextTokenEncoderOptions options, byte[]? model = null, byte[]? vocabulary = null, string runtime = "1.31.1", string tokenizer = "2.0.0") =>
        TextTokenEncoderFactory.Identify(options, Hash(model ?? Model), Hash(vocabulary ?? Vocabulary), runtime, tokenizer).Id;

    private static byte[] Hash(byte[] bytes) => System.Security.Cryptography.SHA256.HashData(bytes);
}
