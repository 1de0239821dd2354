namespace IndexKeeper.Tests.Documents;

/// <summary>
/// Incremental updates as ISO 32000-1 §7.5.6 describes them (new objects, a new cross-reference section
/// and a trailer with /Prev appended to the unchanged original): a new page object changes that page's
/// key only; updates of document metadata change none.
/// </summary>
public sealed class IncrementalUpdateTests : IDisposable
{
    // Object numbers of the three-page document below.
    private const int Catalog = 1;
    private const int Pages = 2;
    private const int SecondPage = 4;
    private const int Font = 6;

    private readonly TempFolder folder = new();

    [Fact]
    public void A_new_page_object_changes_only_that_page()
    {
        var original = ThreePages();
        var next = HandWrittenPdf.SizeOf(original);
        var updated = HandWrittenPdf.AppendUpdate(original, new Dictionary<int, byte[]>
        {
            [next] = HandWrittenPdf.StreamBody(string.Empty, SampleDocuments.Latin("BT /F1 12 Tf 72 700 Td (Aeration basin 2 drained) Tj ET")),
            [SecondPage] = SampleDocuments.Latin($"<< /Type /Page /Parent {Pages} 0 R /Contents {next} 0 R >>"),
        });

        var before = folder.Keys(original);
        var after = folder.Keys(updated);
        Assert.Equal(before[0], after[0]);
        Assert.NotEqual(before[1], after[1]);
        Assert.Equal(before[2], after[2]);

        // qpdf folds the update into one body; the keys stay those of the updated file.
        Assert.Equal(after, folder.Keys(Qpdf.Rewrite(folder, updated)));
    }

    [Fact]
    public void A_page_object_rewritten_without_visible_change_keeps_every_key()
    {
        var original = ThreePages();
        var next = HandWrittenPdf.SizeOf(original);

        // Same operations, now Flate-compressed with other white space in a new stream object.
        var updated = HandWrittenPdf.AppendUpdate(original, new Dictionary<int, byte[]>
        {
            [next] = HandWrittenPdf.StreamBody("/Filter /FlateDecode", TestEncoders.Flate(SampleDocuments.Latin("BT\n/F1   12 Tf\n72 700 Td\n(Aeration basin 2) Tj\nET\n"))),
            [SecondPage] = SampleDocuments.Latin($"<< /Type /Page /Parent {Pages} 0 R /Contents {next} 0 R >>"),
        });

        Assert.Equal(folder.Keys(original), folder.Keys(updated));
    }

    [Fact]
    public void Updates_of_document_metadata_keep_every_key()
    {
        var original = ThreePages();
        var next = HandWrittenPdf.SizeOf(original);
        var xmp = "<?xpacket begin='' id='W5M0MpCehiHzreSzNTczkc9d'?><x:xmpmeta xmlns:x='adobe:ns:meta/'><rdf:RDF xmlns:rdf='http://www.w3.org/1999/02/22-rdf-syntax-ns#'>"
            + "<rdf:Description rdf:about='' xmlns:dc='http://purl.org/dc/elements/1.1/'><dc:title>Harrowmere aeration log, revised</dc:title></rdf:Description></rdf:RDF></x:xmpmeta><?xpacket end='w'?>";
        var updated = HandWrittenPdf.AppendUpdate(
            original,
            new Dictionary<int, byte[]>
            {
                [next] = SampleDocuments.Latin("<< /Title (Harrowmere aeration log, revised) /Author (Plant operations) /ModDate (D:20261201120000Z) >>"),
                [next + 1] = HandWrittenPdf.StreamBody("/Type /Metadata /Subtype /XML", SampleDocuments.Latin(xmp)),
                [Catalog] = SampleDocuments.Latin($"<< /Type /Catalog /Pages {Pages} 0 R /Metadata {next + 1} 0 R /PageMode /UseOutlines >>"),
            },
            $"/Info {next} 0 R");

        var keys = folder.Keys(original);
        Assert.Equal(keys, folder.Keys(updated));
        Assert.Equal(keys, folder.Keys(Qpdf.Rewrite(folder, updated)));
    }

    public void Dispose() => folder.Dispose();

    private static byte[] ThreePages()
    {
        var pdf = new HandWrittenPdf();
        var catalog = pdf.Reserve();
        var pages = pdf.Reserve();
        var first = pdf.Reserve();
        var second = pdf.Reserve();
        var third = pdf.Reserve();
        var font = pdf.Reserve();
        Assert.Equal((Catalog, Pages, SecondPage, Font), (catalog, pages, second, font));

        pdf.Set(font, "<< /Type /Font /Subtype /Type1 /BaseFont /Helvetica >>");
        int Content(string text) => pdf.AddStream(string.Empty, SampleDocuments.Latin($"BT /F1 12 Tf 72 700 Td ({text}) Tj ET"));
        pdf.Set(first, $"<< /Type /Page /Parent {pages} 0 R /Contents {Content("Aeration basin 1")} 0 R >>");
        pdf.Set(second, $"<< /Type /Page /Parent {pages} 0 R /Contents {Content("Aeration basin 2")} 0 R >>");
        pdf.Set(third, $"<< /Type /Page /Parent {pages} 0 R /Contents {Content("Aeration basin 3")} 0 R >>");
        pdf.Set(pages, $"<< /Type /Pages /Kids [{first} 0 R {second} 0 R {third} 0 R] /Count 3 /MediaBox [0 0 595 842] /Resources << /Font << /F1 {font} 0 R >> >> >>");
        pdf.Set(catalog, $"<< /Type /Catalog /Pages {pages} 0 R >>");
        var info = pdf.Add("<< /Title (Harrowmere aeration log) >>");
        return pdf.Build(catalog, $"/Info {info} 0 R");
    }
}
