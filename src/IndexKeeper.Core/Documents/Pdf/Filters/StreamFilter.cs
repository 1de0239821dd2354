namespace IndexKeeper.Core.Documents.Pdf.Filters;

/// <summary>One entry of a stream's filter chain: the filter's full name and its decode parameters.</summary>
internal sealed record StreamFilter(string Name, UglyToad.PdfPig.Tokens.DictionaryToken? Parameters)
{
    /// <summary>
    /// Filters whose output is exactly what the producer put in, so any two encodings of the same data
    /// decode to the same bytes (ISO 32000-1 §7.4.1, Table 6). Lossy or image-codec filters are not here.
    /// </summary>
    public bool IsLossless => Name is "FlateDecode" or "LZWDecode" or "ASCIIHexDecode" or "ASCII85Decode" or "RunLengthDecode";

    /// <summary>Full filter name for the abbreviations allowed in inline images (§8.9.7, Table 94).</summary>
    public static string FullName(string name) => name switch
    {
        "AHx" => "ASCIIHexDecode",
        "A85" => "ASCII85Decode",
        "LZW" => "LZWDecode",
        "Fl" => "FlateDecode",
        "RL" => "RunLengthDecode",
        "CCF" => "CCITTFaxDecode",
        "DCT" => "DCTDecode",
        _ => name,
    };
}
