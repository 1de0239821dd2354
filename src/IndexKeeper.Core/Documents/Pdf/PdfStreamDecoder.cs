using System.IO.Compression;
using IndexKeeper.Core.Documents.Pdf.Filters;
using UglyToad.PdfPig.Tokens;

namespace IndexKeeper.Core.Documents.Pdf;

/// <summary>
/// Undoes the lossless head of a stream's filter chain (Flate, LZW, ASCIIHex, ASCII85, RunLength and
/// their predictors) as a pull stream, and says which filters remain (JPEG, JPX, CCITT, JBIG2 and any
/// unknown filter stay encoded). Decoding never holds more than one buffer of the output.
/// </summary>
internal static class PdfStreamDecoder
{
    /// <summary>Splits the chain of <paramref name="dictionary"/> into the lossless head and the kept tail.</summary>
    public static (IReadOnlyList<StreamFilter> Lossless, IReadOnlyList<StreamFilter> Kept) SplitChain(DictionaryToken dictionary, PdfObjectResolver resolver)
    {
        var filters = ReadChain(dictionary, resolver);
        var head = 0;
        while (head < filters.Count && filters[head].IsLossless)
        {
            head++;
        }

        return (filters.Take(head).ToList(), filters.Skip(head).ToList());
    }

    /// <summary>A stream that yields <paramref name="raw"/> with <paramref name="lossless"/> undone in order.</summary>
    public static Stream Open(ReadOnlyMemory<byte> raw, IReadOnlyList<StreamFilter> lossless)
    {
        var current = ReadOnlyMemoryStream.Create(raw);
        foreach (var filter in lossless)
        {
            current = filter.Name switch
            {
                "FlateDecode" => OpenFlate(current),
                "LZWDecode" => new LzwDecodeStream(current, GetInt(filter.Parameters, "EarlyChange", 1)),
                "ASCIIHexDecode" => new AsciiHexDecodeStream(current),
                "ASCII85Decode" => new Ascii85DecodeStream(current),
                "RunLengthDecode" => new RunLengthDecodeStream(current),
                _ => throw new InvalidOperationException("not a lossless filter: " + filter.Name),
            };

            var predictor = GetInt(filter.Parameters, "Predictor", 1);
            if (filter.Name is "FlateDecode" or "LZWDecode" && PredictorDecodeStream.Applies(predictor))
            {
                current = new PredictorDecodeStream(
                    current,
                    predictor,
                    GetInt(filter.Parameters, "Colors", 1),
                    GetInt(filter.Parameters, "BitsPerComponent", 8),
                    GetInt(filter.Parameters, "Columns", 1));
            }
        }

        return current;
    }

    private static List<StreamFilter> ReadChain(DictionaryToken dictionary, PdfObjectResolver resolver)
    {
        var filterToken = resolver.Resolve(Get(dictionary, "Filter", "F"));
        var parmsToken = resolver.Resolve(Get(dictionary, "DecodeParms", "DP"));
        var names = filterToken switch
        {
            NameToken name => [name],
            ArrayToken array => array.Data.Select(resolver.Resolve).OfType<NameToken>().ToList(),
            _ => new List<NameToken>(),
        };
        var parms = parmsToken switch
        {
            DictionaryToken single => [single],
            ArrayToken array => array.Data.Select(t => resolver.Resolve(t) as DictionaryToken).ToList(),
            _ => new List<DictionaryToken?>(),
        };
        var chain = new List<StreamFilter>(names.Count);
        for (var i = 0; i < names.Count; i++)
        {
            chain.Add(new StreamFilter(StreamFilter.FullName(names[i].Data), i < parms.Count ? parms[i] : null));
        }

        return chain;
    }

    private static IToken? Get(DictionaryToken dictionary, string name, string abbreviation) =>
        dictionary.Data.TryGetValue(name, out var value) ? value
        : dictionary.Data.TryGetValue(abbreviation, out var shortValue) ? shortValue
        : null;

    private static Stream OpenFlate(Stream source)
    {
        // A zlib header (RFC 1950 §2.2) is checked; producers that wrote raw deflate data (RFC 1951)
        // without it are read too, as common PDF readers do.
        Span<byte> header = stackalloc byte[2];
        var read = source.ReadAtLeast(header, 2, throwOnEndOfStream: false);
        var rest = new PrefixedStream(header[..read].ToArray(), source);
        var isZlib = read == 2 && (header[0] & 0x0F) == 8 && ((header[0] << 8) | header[1]) % 31 == 0;
        return isZlib ? new ZLibStream(rest, CompressionMode.Decompress) : new DeflateStream(rest, CompressionMode.Decompress);
    }

    private static int GetInt(DictionaryToken? parameters, string key, int fallback) =>
        parameters is not null && parameters.Data.TryGetValue(key, out var token) && token is NumericToken number
            ? (int)Math.Clamp(number.Data, int.MinValue, int.MaxValue)
            : fallback;
}
