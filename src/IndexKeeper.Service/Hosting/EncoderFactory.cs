using IndexKeeper.Core.Encoding;
using IndexKeeper.Core.Encoding.PageImages;
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
            PageImageEncoderFactory.Name => CreatePageImage(options),
            _ => throw new ConfigurationException([$"Encoder:Name: '{options.Name}' is not an encoder."]),
        };
    }

    private static IPageEncoder CreatePageImage(EncoderOptions options)
    {
        var problems = PageImageSettings.Validate(options).ToList();
        if (problems.Count > 0)
        {
            throw new ConfigurationException(problems);
        }

        try
        {
            return PageImageEncoderFactory.Create(PageImageSettings.ToEncoderOptions(options));
        }
        catch (InvalidOperationException e)
        {
            // pdftoppm that does not answer, a graph without the named tensors: the message starts with the setting.
            throw new ConfigurationException([PageImageSettings.Qualify(e.Message)]);
        }
    }
}
