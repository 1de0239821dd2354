using System.IO.Compression;
using IndexKeeper.Core.Documents;

namespace IndexKeeper.Tests.Documents;

/// <summary>
/// Hostile and unreadable files end in a <see cref="DocumentReadException"/> with the right reason and
/// never take the test process down (a failure of the cycle guard would abort the whole test run with
/// a stack overflow inside the parser, which is the point of testing it here).
/// </summary>
public sealed class GuardTests : IDisposable
{
    private readonly TempFolder folder = new();

    [Fact]
    public void Two_forms_that_draw_each_other_are_corrupt()
    {
        var pdf = OnePage(out var page, out var content);
        var formA = pdf.Reserve();
        var formB = pdf.Reserve();
        pdf.SetStream(formA, $"/Type /XObject /Subtype /Form /BBox [0 0 10 10] /Resources << /XObject << /B {formB} 0 R >> >>", Ascii("/B Do"));
        pdf.SetStream(formB, $"/Type /XObject /Subtype /Form /BBox [0 0 10 10] /Resources << /XObject << /A {formA} 0 R >> >>", Ascii("/A Do"));
        pdf.SetStream(content, string.Empty, Ascii("/A Do"));
        var error = folder.ReadFails(Finish(pdf, page, $"/Resources << /XObject << /A {formA} 0 R >> >>"));
        Assert.Equal(QuarantineReason.Corrupt, error.Reason);
        Assert.Contains("cycle", error.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void A_form_without_resources_that_draws_itself_through_the_page_is_corrupt()
    {
        // The form has no /Resources, so its names resolve in the page's, where "A" is the form itself.
        var pdf = OnePage(out var page, out var content);
        var form = pdf.AddStream("/Type /XObject /Subtype /Form /BBox [0 0 10 10]", Ascii("/A Do"));
        pdf.SetStream(content, string.Empty, Ascii("q /A Do Q"));
        var error = folder.ReadFails(Finish(pdf, page, $"/Resources << /XObject << /A {form} 0 R >> >>"));
        Assert.Equal(QuarantineReason.Corrupt, error.Reason);
    }

    [Fact]
    public void A_content_stream_that_inflates_past_the_cap_is_refused()
    {
        var pdf = OnePage(out var page, out var content);
        pdf.SetStream(content, "/Filter /FlateDecode", TestEncoders.Flate(new byte[4 << 20], CompressionLevel.SmallestSize));
        var limits = ReadLimits.Default with { MaxDecodedBytesPerStream = 1 << 20 };
        var error = folder.ReadFails(Finish(pdf, page, string.Empty), limits);
        Assert.Equal(QuarantineReason.DecodedStreamTooLarge, error.Reason);
    }

    [Fact]
    public void A_font_program_bomb_in_an_unused_font_is_refused_before_the_parser_loads_it()
    {
        var pdf = OnePage(out var page, out var content);
        var bomb = pdf.AddStream("/Filter /FlateDecode", TestEncoders.Flate(new byte[4 << 20], CompressionLevel.SmallestSize));
        var descriptor = pdf.Add($"<< /Type /FontDescriptor /FontName /Bomb /Flags 32 /FontBBox [0 0 1000 1000] /ItalicAngle 0 /Ascent 800 /Descent -200 /CapHeight 700 /StemV 80 /FontFile2 {bomb} 0 R >>");
        var font = pdf.Add($"<< /Type /Font /Subtype /TrueType /BaseFont /Bomb /FirstChar 32 /LastChar 32 /Widths [500] /FontDescriptor {descriptor} 0 R >>");
        pdf.SetStream(content, string.Empty, Ascii("0 0 10 10 re f"));
        var limits = ReadLimits.Default with { MaxDecodedBytesPerStream = 1 << 20 };
        var error = folder.ReadFails(Finish(pdf, page, $"/Resources << /Font << /Unused {font} 0 R >> >>"), limits);
        Assert.Equal(QuarantineReason.DecodedStreamTooLarge, error.Reason);
    }

    [Fact]
    public void The_same_streams_under_the_cap_read()
    {
        var pdf = OnePage(out var page, out var content);
        pdf.SetStream(content, "/Filter /FlateDecode", TestEncoders.Flate(new byte[1 << 19]));
        var document = folder.Read(Finish(pdf, page, string.Empty), ReadLimits.Default with { MaxDecodedBytesPerStream = 1 << 20 });
        Assert.Single(document.Pages);
    }

    [Fact]
    public void Arrays_nested_100000_deep_are_corrupt()
    {
        var pdf = OnePage(out var page, out var content);
        var nested = new string('[', 100_000) + new string(']', 100_000);
        pdf.SetStream(content, string.Empty, Ascii(nested + " pop 0 0 10 10 re f"));
        var error = folder.ReadFails(Finish(pdf, page, string.Empty));
        Assert.Equal(QuarantineReason.Corrupt, error.Reason);
    }

    [Fact]
    public void A_reference_chain_of_20000_links_is_corrupt()
    {
        var pdf = OnePage(out var page, out var content);
        var first = pdf.Reserve();
        var previous = first;
        for (var i = 0; i < 20_000; i++)
        {
            var link = pdf.Reserve();
            pdf.Set(previous, $"{link} 0 R");
            previous = link;
        }

        pdf.Set(previous, "<< /Type /ExtGState /ca 0.5 >>");
        pdf.SetStream(content, string.Empty, Ascii("/G gs 0 0 10 10 re f"));
        var error = folder.ReadFails(Finish(pdf, page, $"/Resources << /ExtGState << /G {first} 0 R >> >>"));
        Assert.Equal(QuarantineReason.Corrupt, error.Reason);
    }

    [Fact]
    public void A_reference_to_a_missing_object_reads_as_null()
    {
        // ISO 32000-1 §7.3.10: an indirect reference to an undefined object is the null object.
        var pdf = OnePage(out var page, out var content);
        pdf.SetStream(content, string.Empty, Ascii("/G gs 0 0 10 10 re f"));
        var document = folder.Read(Finish(pdf, page, "/Resources << /ExtGState << /G 999 0 R >> >>"));
        Assert.Single(document.Pages);
    }

    [Fact]
    public void Random_bytes_are_unsupported_and_random_bytes_after_a_pdf_header_are_corrupt()
    {
        var random = new Random(20261201);
        var noise = new byte[4096];
        random.NextBytes(noise);
        noise[0] = 0x01; // not a signature of any supported kind
        Assert.Equal(QuarantineReason.Unsupported, folder.ReadFails(noise).Reason);

        var withHeader = Ascii("%PDF-1.7\n").Concat(noise).ToArray();
        Assert.Equal(QuarantineReason.Corrupt, folder.ReadFails(withHeader).Reason);
    }

    [Fact]
    public void An_empty_file_is_unsupported()
    {
        var error = folder.ReadFails([]);
        Assert.Equal(QuarantineReason.Unsupported, error.Reason);
        Assert.Contains("empty", error.Message, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("harrowmere-user")]
    [InlineData("")]
    public void An_encrypted_pdf_is_quarantined_as_encrypted(string userPassword)
    {
        // qpdf --encrypt USER OWNER 256 -- (qpdf manual, "Encryption"); an empty user password opens
        // without asking but is still a request for protection.
        var encrypted = Qpdf.Rewrite(folder, SampleDocuments.Builder(2), "--encrypt", userPassword, "harrowmere-owner", "256", "--");
        Assert.Equal(QuarantineReason.Encrypted, folder.ReadFails(encrypted).Reason);
    }

    [Fact]
    public void Limits_on_pages_and_file_size_are_enforced()
    {
        var document = SampleDocuments.Builder(4);
        Assert.Equal(QuarantineReason.TooManyPages, folder.ReadFails(document, ReadLimits.Default with { MaxPages = 3 }).Reason);
        Assert.Equal(QuarantineReason.TooLarge, folder.ReadFails(document, ReadLimits.Default with { MaxFileBytes = document.Length - 1 }).Reason);
        Assert.Equal(4, folder.Read(document, ReadLimits.Default with { MaxPages = 4, MaxFileBytes = document.Length }).Pages.Count);
    }

    [Fact]
    public void A_missing_file_is_unreadable()
    {
        var error = Assert.Throws<DocumentReadException>(() =>
            DocumentReaderFactory.Create().Read(folder.PathOf("not-there.pdf"), ReadLimits.Default, CancellationToken.None));
        Assert.Equal(QuarantineReason.Unreadable, error.Reason);
    }

    [Fact]
    public void Damaged_copies_either_read_or_fail_with_a_reason()
    {
        // Flipped bytes and zeroed blocks at fixed places: any outcome but another exception type is fine.
        var original = SampleDocuments.Rich();
        var random = new Random(7);
        for (var variant = 0; variant < 40; variant++)
        {
            var damaged = (byte[])original.Clone();
            if (variant % 2 == 0)
            {
                damaged[random.Next(damaged.Length)] ^= (byte)(1 + random.Next(255));
            }
            else
            {
                var at = random.Next(damaged.Length - 64);
                Array.Clear(damaged, at, 64);
            }

            try
            {
                folder.Read(damaged);
            }
            catch (DocumentReadException e)
            {
                Assert.False(string.IsNullOrWhiteSpace(e.Message));
            }
        }
    }

    public void Dispose() => folder.Dispose();

    private static byte[] Ascii(string text) => System.Text.Encoding.ASCII.GetBytes(text);

    private static HandWrittenPdf OnePage(out int page, out int content)
    {
        var pdf = new HandWrittenPdf();
        pdf.Reserve(); // 1: catalog
        pdf.Reserve(); // 2: pages
        page = pdf.Reserve();
        content = pdf.Reserve();
        return pdf;
    }

    private static byte[] Finish(HandWrittenPdf pdf, int page, string pageEntries)
    {
        pdf.Set(1, "<< /Type /Catalog /Pages 2 0 R >>");
        pdf.Set(2, $"<< /Type /Pages /Kids [{page} 0 R] /Count 1 >>");
        pdf.Set(page, $"<< /Type /Page /Parent 2 0 R /MediaBox [0 0 200 200] /Contents {page + 1} 0 R {pageEntries} >>");
        return pdf.Build(1);
    }
}
