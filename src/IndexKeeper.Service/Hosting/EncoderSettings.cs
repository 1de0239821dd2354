using System.Globalization;
using System.Text.Json;
using IndexKeeper.Core.Encoding.PageImages;
using IndexKeeper.Service.Configuration;

namespace IndexKeeper.Service.Hosting;

/// <summary>
/// The encoder settings recorded with an encoder id in the catalog (docs/catalog.md, <c>encoders.Settings</c>),
/// so an index that still serves an older encoder during a migration can build it again to encode queries.
/// Only settings that change the vectors are recorded; threads and batch sizes come from the current configuration.
/// </summary>
public static class EncoderSettings
{
    public static IReadOnlyDictionary<string, string> Record(EncoderOptions options)
    {
        ArgumentNullException.ThrowIfNull(options);
        return new Dictionary<string, string>(StringComparer.Ordinal)
        {
            [nameof(EncoderOptions.Name)] = options.Name,
            [nameof(EncoderOptions.Dimensions)] = options.Dimensions.ToString(CultureInfo.InvariantCulture),
            [nameof(EncoderOptions.PoolFactor)] = options.PoolFactor.ToString(CultureInfo.InvariantCulture),

            // Model paths, tensor names and pre-processing; a rebuilt encoder is used only if its id matches.
            [nameof(EncoderOptions.PageImage)] = JsonSerializer.Serialize(options.PageImage),
        };
    }

    /// <summary>The options that build the recorded encoder, or null when the record lacks a setting.</summary>
    public static EncoderOptions? Rebuild(IReadOnlyDictionary<string, string> recorded, EncoderOptions current)
    {
        ArgumentNullException.ThrowIfNull(recorded);
        ArgumentNullException.ThrowIfNull(current);
        if (!recorded.TryGetValue(nameof(EncoderOptions.Name), out var name) ||
            !TryInt(recorded, nameof(EncoderOptions.Dimensions), out var dimensions) ||
            !TryInt(recorded, nameof(EncoderOptions.PoolFactor), out var poolFactor))
        {
            return null;
        }

        var pageImage = current.PageImage;
        if (recorded.TryGetValue(nameof(EncoderOptions.PageImage), out var pageImageJson))
        {
            try
            {
                pageImage = JsonSerializer.Deserialize<PageImageModelOptions>(pageImageJson) ?? pageImage;
            }
            catch (JsonException)
            {
                return null;
            }
        }
        else if (name == PageImageEncoderFactory.Name)
        {
            return null;
        }

        return new EncoderOptions
        {
            Name = name,
            Dimensions = dimensions,
            PoolFactor = poolFactor,
            BatchSize = current.BatchSize,
            IntraOpThreads = current.IntraOpThreads,
            PageImage = pageImage,
        };
    }

    private static bool TryInt(IReadOnlyDictionary<string, string> recorded, string key, out int value)
    {
        value = 0;
        return recorded.TryGetValue(key, out var text) && int.TryParse(text, NumberStyles.Integer, CultureInfo.InvariantCulture, out value);
    }
}
