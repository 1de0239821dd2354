using IndexKeeper.Service.Configuration;

namespace IndexKeeper.Tests.Encoding.TextTokens;

public sealed class TextTokenConfigurationTests
{
    [Fact]
    public void The_service_knows_minilm_and_makes_it_the_default()
    {
        Assert.Contains("minilm", IndexKeeperOptionsValidator.EncoderNames);
        Assert.Equal("minilm", new EncoderOptions().Name);
        Assert.Contains("hashed-terms", IndexKeeperOptionsValidator.EncoderNames);
        Assert.Empty(IndexKeeperOptionsValidator.Validate(Options("minilm", 128, 2)));
    }

    [Fact]
    public void Settings_the_text_token_encoder_cannot_take_are_named()
    {
        var errors = IndexKeeperOptionsValidator.Validate(Options("minilm", 448, -1));
        Assert.Contains(errors, e => e.StartsWith("Encoder:Dimensions:", StringComparison.Ordinal) && e.Contains("384", StringComparison.Ordinal));
        Assert.Contains(errors, e => e.StartsWith("Encoder:IntraOpThreads:", StringComparison.Ordinal));
        Assert.Empty(IndexKeeperOptionsValidator.Validate(Options("hashed-terms", 448, 1)));
    }

    private static IndexKeeperOptions Options(string encoder, int dimensions, int threads) => new()
    {
        IndexDirectory = "/srv/harrowmere/index",
        Roots = [new RootOptions { Name = "shared-drive", Path = "/srv/harrowmere/shared-drive" }],
        Encoder = new EncoderOptions { Name = encoder, Dimensions = dimensions, IntraOpThreads = threads },
    };
}
