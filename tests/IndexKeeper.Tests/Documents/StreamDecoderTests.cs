using System.IO.Compression;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Documents.Pdf;
using IndexKeeper.Core.Documents.Pdf.Filters;
using UglyToad.PdfPig.Tokens;

namespace IndexKeeper.Tests.Documents;

/// <summary>
/// The lossless filters of ISO 32000-1 §7.4 against published examples and against qpdf's decoders: a
/// PDF holds one stream per encoding, qpdf prints each decoded (--show-object --filtered-stream-data),
/// and both qpdf's output and ours must equal the original bytes.
/// </summary>
public sealed class StreamDecoderTests : IDisposable
{
    private readonly TempFolder folder = new();

    [Fact]
    public void Lzw_decodes_the_example_of_the_standard()
    {
        // ISO 32000-1 §7.4.4.2 example (quoted from memory): 45 45 45 45 45 65 45 45 45 66 encodes as the
        // codes 256 45 258 258 65 259 66 257, packed into 9-bit groups as 80 0B 60 50 22 0C 0C 85 01.
        byte[] encoded = [0x80, 0x0B, 0x60, 0x50, 0x22, 0x0C, 0x0C, 0x85, 0x01];
        Assert.Equal([45, 45, 45, 45, 45, 65, 45, 45, 45, 66], Decode(encoded, new StreamFilter("LZWDecode", null)));
        Assert.Equal(encoded, TestEncoders.Lzw([45, 45, 45, 45, 45, 65, 45, 45, 45, 66]));
    }

    [Theory]
    [InlineData("Harrowmere Water Authority", "87?OZDg-&0Eb-@p@<?($+@1-lBQ%p*FEm~>")]
    [InlineData("\0\0\0\0abc", "z@:E^~>")]
    public void Ascii85_decodes_vectors_of_an_independent_encoder(string plain, string encoded)
    {
        // Vectors from Python's standard library, base64.a85encode(data, adobe=False), plus the "~>" end.
        Assert.Equal(System.Text.Encoding.Latin1.GetBytes(plain), Decode(System.Text.Encoding.ASCII.GetBytes(encoded), new StreamFilter("ASCII85Decode", null)));
    }

    [Fact]
    public void Every_lossless_encoding_decodes_like_qpdf_decodes_it()
    {
        var payload = Payload();
        var predictorParms = "<< /Predictor 12 /Colors 3 /BitsPerComponent 8 /Columns 20 >>";
        var tiffParms = "<< /Predictor 2 /Colors 3 /BitsPerComponent 8 /Columns 20 >>";
        var cases = new List<(string Entries, byte[] Encoded, StreamFilter[] Chain)>
        {
            ("/Filter /FlateDecode", TestEncoders.Flate(payload), [Filter("FlateDecode")]),
            ("/Filter /FlateDecode /DecodeParms " + predictorParms, TestEncoders.Flate(TestEncoders.PngPredict(payload, 3, 60)), [Filter("FlateDecode", 12, 3, 20)]),
            ("/Filter /FlateDecode /DecodeParms " + tiffParms, TestEncoders.Flate(TestEncoders.TiffPredict(payload, 3, 60)), [Filter("FlateDecode", 2, 3, 20)]),
            ("/Filter /LZWDecode", TestEncoders.Lzw(payload), [Filter("LZWDecode")]),
            ("/Filter /LZWDecode /DecodeParms " + predictorParms, TestEncoders.Lzw(TestEncoders.PngPredict(payload, 3, 60)), [Filter("LZWDecode", 12, 3, 20)]),
            ("/Filter /ASCIIHexDecode", TestEncoders.AsciiHex(payload), [Filter("ASCIIHexDecode")]),
            ("/Filter /ASCII85Decode", TestEncoders.Ascii85(payload), [Filter("ASCII85Decode")]),
            ("/Filter /RunLengthDecode", TestEncoders.RunLength(payload), [Filter("RunLengthDecode")]),
            ("/Filter [/ASCII85Decode /FlateDecode]", TestEncoders.Ascii85(TestEncoders.Flate(payload)), [Filter("ASCII85Decode"), Filter("FlateDecode")]),
            ("/Filter [/ASCIIHexDecode /LZWDecode]", TestEncoders.AsciiHex(TestEncoders.Lzw(payload)), [Filter("ASCIIHexDecode"), Filter("LZWDecode")]),
        };

        var pdf = new HandWrittenPdf();
        var catalog = pdf.Reserve();
        var pages = pdf.Reserve();
        var numbers = cases.Select(c => pdf.AddStream(c.Entries, c.Encoded)).ToList();
        pdf.Set(pages, "<< /Type /Pages /Kids [] /Count 0 >>");
        pdf.Set(catalog, $"<< /Type /Catalog /Pages {pages} 0 R /Harrowmere [{string.Join(' ', numbers.Select(n => $"{n} 0 R"))}] >>");
        var path = folder.Write("filters.pdf", pdf.Build(catalog));

        for (var i = 0; i < cases.Count; i++)
        {
            var byQpdf = Qpdf.Run("--show-object=" + numbers[i], "--filtered-stream-data", path);
            Assert.True(payload.SequenceEqual(byQpdf), $"qpdf decodes case {i} ({cases[i].Entries}) differently from the payload");
            Assert.True(payload.SequenceEqual(Decode(cases[i].Encoded, cases[i].Chain)), $"case {i} ({cases[i].Entries}) decodes wrongly");
        }
    }

    [Fact]
    public void Damaged_deflate_data_ends_the_stream_where_it_breaks()
    {
        var encoded = TestEncoders.Flate(Payload());
        var damaged = encoded[..(encoded.Length / 2)].Concat(new byte[] { 0xFF, 0xFF, 0xFF, 0xFF }).ToArray();
        var (length, isDamaged) = CappedDrain.Run(PdfStreamDecoder.Open(damaged, [Filter("FlateDecode")]), 1 << 20, null, null, "test", CancellationToken.None);
        Assert.True(isDamaged || length < Payload().Length);
    }

    [Fact]
    public void The_cap_stops_a_stream_without_decoding_it_all()
    {
        // 1 GiB of zeros deflates to about 1 MB; the cap stops it after its first MiB.
        var bomb = new MemoryStream();
        using (var zlib = new ZLibStream(bomb, CompressionLevel.SmallestSize, leaveOpen: true))
        {
            var zeros = new byte[1 << 20];
            for (var i = 0; i < 1024; i++)
            {
                zlib.Write(zeros);
            }
        }

        var error = Assert.Throws<DocumentReadException>(() =>
            CappedDrain.Run(PdfStreamDecoder.Open(bomb.ToArray(), [Filter("FlateDecode")]), 1 << 20, null, null, "a test stream", CancellationToken.None));
        Assert.Equal(QuarantineReason.DecodedStreamTooLarge, error.Reason);
    }

    public void Dispose() => folder.Dispose();

    private static byte[] Payload()
    {
        // Text with repeats (runs for RunLength, strings for LZW) and every byte value; 1200 bytes = 20 rows of 60.
        var text = System.Text.Encoding.ASCII.GetBytes(string.Concat(Enumerable.Repeat("Harrowmere filter gallery ", 30)));
        return text.Concat(Enumerable.Range(0, 256).Select(i => (byte)i)).Concat(new byte[164]).Take(1200).ToArray();
    }

    private static StreamFilter Filter(string name) => new(name, null);

    private static StreamFilter Filter(string name, int predictor, int colors, int columns) => new(
        name,
        new DictionaryToken(new Dictionary<NameToken, IToken>
        {
            [NameToken.Create("Predictor")] = new NumericToken(predictor),
            [NameToken.Create("Colors")] = new NumericToken(colors),
            [NameToken.Create("BitsPerComponent")] = new NumericToken(8),
            [NameToken.Create("Columns")] = new NumericToken(columns),
        }));

    private static byte[] Decode(byte[] encoded, params StreamFilter[] chain)
    {
        using var decoded = PdfStreamDecoder.Open(encoded, chain);
        var output = new MemoryStream();
        decoded.CopyTo(output);
        return output.ToArray();
    }
}
