using System.Globalization;
using IndexKeeper.Core.Documents.Pdf.Filters;
using UglyToad.PdfPig.Tokens;

namespace IndexKeeper.Core.Documents.Pdf;

/// <summary>
/// Turns an inline image (BI … ID … EI) into the image XObject it stands for (ISO 32000-1 §8.9.7:
/// abbreviated keys of Table 93 and abbreviated values of Table 94 spelled out), so an inline image and
/// an image XObject with the same data hash to the same record.
/// </summary>
internal static class InlineImageNames
{
    private static readonly Dictionary<string, string> Keys = new(StringComparer.Ordinal)
    {
        ["BPC"] = "BitsPerComponent",
        ["CS"] = "ColorSpace",
        ["D"] = "Decode",
        ["DP"] = "DecodeParms",
        ["F"] = "Filter",
        ["H"] = "Height",
        ["IM"] = "ImageMask",
        ["I"] = "Interpolate",
        ["W"] = "Width",
        ["L"] = "Length",
    };

    /// <summary>The image as a stream object; <paramref name="colourSpaceResource"/> resolves a named colour space.</summary>
    public static StreamToken ToStream(ContentValue.Dictionary dictionary, byte[] data, Func<string, IToken?> colourSpaceResource)
    {
        var entries = new Dictionary<NameToken, IToken>();
        foreach (var (rawKey, value) in dictionary.Entries)
        {
            var key = Keys.GetValueOrDefault(rawKey, rawKey);
            entries[NameToken.Create(key)] = key switch
            {
                "ColorSpace" => ColourSpace(value, colourSpaceResource),
                "Filter" => Map(value, StreamFilter.FullName),
                _ => ToToken(value),
            };
        }

        return new StreamToken(new DictionaryToken(entries), data);
    }

    /// <summary>Bytes of an unfiltered inline image, when its dictionary says enough to know them.</summary>
    public static long? UnfilteredLength(ContentValue.Dictionary dictionary)
    {
        ContentValue? Find(string full, string abbreviation) =>
            dictionary.Entries.FirstOrDefault(e => e.Key == full || e.Key == abbreviation).Value;

        if (Find("Length", "L") is ContentValue.Number explicitLength)
        {
            return (long)double.Parse(explicitLength.Canonical, CultureInfo.InvariantCulture);
        }

        if (Find("Filter", "F") is not null and not ContentValue.Null)
        {
            return null;
        }

        var isMask = Find("ImageMask", "IM") is ContentValue.Boolean { Value: true };
        var components = isMask ? 1 : Find("ColorSpace", "CS") switch
        {
            ContentValue.Name { Value: "G" or "DeviceGray" or "CalGray" } => 1,
            ContentValue.Name { Value: "RGB" or "DeviceRGB" or "CalRGB" } => 3,
            ContentValue.Name { Value: "CMYK" or "DeviceCMYK" } => 4,
            ContentValue.Array { Items: [ContentValue.Name { Value: "I" or "Indexed" }, ..] } => 1,
            _ => 0,
        };
        var bits = isMask ? 1 : Find("BitsPerComponent", "BPC") is ContentValue.Number bpc ? Parse(bpc) : 0;
        var width = Find("Width", "W") is ContentValue.Number w ? Parse(w) : 0;
        var height = Find("Height", "H") is ContentValue.Number h ? Parse(h) : 0;
        if (components == 0 || bits <= 0 || width <= 0 || height <= 0)
        {
            return null;
        }

        return (((long)width * components * bits) + 7) / 8 * height;
    }

    private static int Parse(ContentValue.Number number) =>
        (int)Math.Clamp(double.Parse(number.Canonical, CultureInfo.InvariantCulture), 0, int.MaxValue);

    private static IToken ColourSpace(ContentValue value, Func<string, IToken?> colourSpaceResource) => value switch
    {
        ContentValue.Name { Value: "G" } => NameToken.Create("DeviceGray"),
        ContentValue.Name { Value: "RGB" } => NameToken.Create("DeviceRGB"),
        ContentValue.Name { Value: "CMYK" } => NameToken.Create("DeviceCMYK"),
        ContentValue.Name { Value: "I" } => NameToken.Create("Indexed"),
        ContentValue.Name { Value: "DeviceGray" or "DeviceRGB" or "DeviceCMYK" or "Indexed" or "Pattern" } name => NameToken.Create(name.Value),
        ContentValue.Name name => colourSpaceResource(name.Value) ?? NameToken.Create(name.Value),
        ContentValue.Array array => new ArrayToken(array.Items.Select(i => ColourSpace(i, colourSpaceResource)).ToList()),
        _ => ToToken(value),
    };

    private static IToken Map(ContentValue value, Func<string, string> names) => value switch
    {
        ContentValue.Name name => NameToken.Create(names(name.Value)),
        ContentValue.Array array => new ArrayToken(array.Items.Select(i => Map(i, names)).ToList()),
        _ => ToToken(value),
    };

    private static IToken ToToken(ContentValue value) => value switch
    {
        ContentValue.Number number => new NumericToken(double.Parse(number.Canonical, CultureInfo.InvariantCulture)),
        ContentValue.Text text => new HexToken(Convert.ToHexString(text.Bytes).AsSpan()),
        ContentValue.Name name => NameToken.Create(name.Value),
        ContentValue.Boolean boolean => boolean.Value ? BooleanToken.True : BooleanToken.False,
        ContentValue.Array array => new ArrayToken(array.Items.Select(ToToken).ToList()),
        ContentValue.Dictionary nested => ToDictionaryToken(nested),
        _ => NullToken.Instance,
    };

    private static DictionaryToken ToDictionaryToken(ContentValue.Dictionary dictionary)
    {
        // A repeated key keeps its last value, as a dictionary read from a file would.
        var entries = new Dictionary<NameToken, IToken>();
        foreach (var (key, value) in dictionary.Entries)
        {
            entries[NameToken.Create(key)] = ToToken(value);
        }

        return new DictionaryToken(entries);
    }
}
