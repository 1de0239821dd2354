using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Encoding.TextTokens;
using IndexKeeper.Service.Configuration;

namespace IndexKeeper.Service.Hosting;

/// <summary>Builds the configured (active) encoder from validated settings.</summary>
public static class EncoderFactory
{
    public static IPageEncoder Create(EncoderOptions options)
    {
        ArgumentNullException.ThrowIfNull(options);
        return options.Name switch
        {
            "hashed-terms" => HashedTermEncoderFactory.Create(new HashedTermEncoderOptions
            {
                Dimensions = options.Dimensions,
                PoolFactor = options.PoolFactor,
            }),
            TextTokenEncoderFactory.Name => TextTokenEncoderFactory.Create(new TextTokenEncoderOptions
            {
                Dimensions = options.Dimensions,
                PoolFactor = options.PoolFactor,
                IntraOpThreads = options.IntraOpThreads,
            }),
            _ => throw new ConfigurationException([$"Encoder:Name: '{options.Name}' is not an encoder."]),
        };
    }
}
