using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Documents.Office;

namespace IndexKeeper.Tests.Readers;

public sealed class OfficeReaderTests(OfficeFixture fixture) : IClassFixture<OfficeFixture>
{
    [Theory]
    [InlineData(".docx", DocumentKind.OfficeOpenXml)]
    [InlineData(".xlsx", DocumentKind.OfficeOpenXml)]
    [InlineData(".pptx", DocumentKind.OfficeOpenXml)]
    [InlineData(".odt", DocumentKind.OpenDocument)]
    public void Page_count_is_that_of_libreoffices_own_export(string extension, DocumentKind kind)
    {
        // Reference: LibreOffice's command-line PDF export of the same file, counted by poppler's pdfinfo.
        var content = fixture.Read[extension];
        Assert.Equal(kind, content.Kind);
        Assert.Equal(fixture.ReferencePages[extension], content.Pages.Count);
        Assert.All(content.Pages, p => Assert.NotEmpty(p.Words));
    }

    [Fact]
    public void The_letter_has_two_pages_with_its_words()
    {
        var letter = fixture.Read[".docx"];
        Assert.Equal(2, letter.Pages.Count);
        Assert.Contains(letter.Pages[0].Words, w => w.Text == "Kellmarsh:");
        Assert.Contains(letter.Pages[1].Words, w => w.Text == "Annex:");
    }

    [Fact]
    public void A_resave_with_other_metadata_keeps_every_page_key()
    {
        Assert.Equal(fixture.Read[".docx"].Pages.Select(p => p.Key), fixture.Resaved.Pages.Select(p => p.Key));
    }

    [Fact]
    public void A_visible_edit_changes_the_key_of_its_page_only()
    {
        // The edit adds no letter the document lacked, nor one earlier than before: LibreOffice numbers the
        // glyphs of its embedded font subset in order of first use, and every page drawn with that font
        // hashes the subset (docs/readers.md, "Limits").
        var path = fixture.Write("letter-edited.docx", OfficeSamples.Letter("R. Pennock", new DateTime(2024, 3, 1, 9, 15, 0, DateTimeKind.Utc), "Harbour board of Kellmarsh: berth allocation for the spring seasons"));
        var edited = fixture.Reader.Read(path, ReadLimits.Default, CancellationToken.None);
        var original = fixture.Read[".docx"];
        Assert.NotEqual(original.Pages[0].Key, edited.Pages[0].Key);
        Assert.Equal(original.Pages[1].Key, edited.Pages[1].Key);
    }

    [Fact]
    public void Converted_keys_are_salted_with_the_converter_version()
    {
        var pdfKey = PageKey.Of("a PDF page"u8);
        var one = ConvertedPageKey.Of("LibreOffice 7.4.7.2 40(Build:2)", pdfKey);
        Assert.NotEqual(pdfKey, one);
        Assert.NotEqual(one, ConvertedPageKey.Of("LibreOffice 7.4.7.3 40(Build:3)", pdfKey));
        Assert.Equal(one, ConvertedPageKey.Of("LibreOffice 7.4.7.2 40(Build:2)", pdfKey));
    }

    [Fact]
    public void A_missing_converter_quarantines_with_the_package_name()
    {
        var reader = DocumentReaderFactory.Create(ReaderSettings.Default with { OfficeConverter = "/nonexistent/soffice" });
        var path = fixture.Write("no-converter.docx", OfficeSamples.Letter("A", DateTime.UnixEpoch));
        var failure = Assert.Throws<DocumentReadException>(() => reader.Read(path, ReadLimits.Default, CancellationToken.None));
        Assert.Equal(QuarantineReason.ToolMissing, failure.Reason);
        Assert.Contains("libreoffice-core-nogui", failure.Message, StringComparison.Ordinal);
    }
}
