using DocumentFormat.OpenXml.Packaging;
using IndexKeeper.Core.Documents;
using IndexKeeper.Tests.Demo;
using IndexKeeper.Tests.Support;
using MimeKit;
using UglyToad.PdfPig.Core;
using UglyToad.PdfPig.Fonts.Standard14Fonts;
using UglyToad.PdfPig.Writer;

namespace IndexKeeper.Tests.Readers;

/// <summary>
/// The title a document gives itself, as hits carry it. A PDF's is its document information Title (ISO
/// 32000-1 §14.3.3), checked against what poppler's pdfinfo (Debian poppler-utils) reads from the same
/// file; an office file's is the one LibreOffice carries into the PDF it draws, checked against pdfinfo on
/// LibreOffice's own PDF export; an HTML page's is its title element (WHATWG HTML: the text, white space
/// stripped and collapsed); an e-mail's is its Subject (RFC 5322 §3.6.5).
/// </summary>
public sealed class DocumentTitleTests
{
    private readonly IDocumentReader reader = DocumentReaderFactory.Create();

    [Fact]
    public void A_pdf_title_is_what_pdfinfo_reads()
    {
        using var temp = new TempDirectory();
        var path = temp.Combine("tide-tables.pdf");
        File.WriteAllBytes(path, Pdf("Kellmarsh harbour board: tide tables 2031"));

        var content = reader.Read(path, ReadLimits.Default, CancellationToken.None);

        Assert.Equal("Kellmarsh harbour board: tide tables 2031", content.Title);
        Assert.Equal(PdfinfoTitle(path), content.Title);
    }

    [Fact]
    public void A_pdf_without_a_title_has_none()
    {
        using var temp = new TempDirectory();
        var path = temp.Combine("untitled.pdf");
        File.WriteAllBytes(path, Pdf(null));

        Assert.Null(reader.Read(path, ReadLimits.Default, CancellationToken.None).Title);
        Assert.Null(PdfinfoTitle(path));
    }

    [Fact]
    public void An_office_title_comes_through_the_drawn_pdf()
    {
        using var temp = new TempDirectory();
        var path = temp.Combine("berths.docx");
        File.WriteAllBytes(path, OfficeSamples.Letter("R. Tamsett", new DateTime(2031, 3, 10, 9, 0, 0, DateTimeKind.Utc)));
        using (var document = WordprocessingDocument.Open(path, isEditable: true))
        {
            document.PackageProperties.Title = "Berth allocation, spring 2031";
        }

        var content = reader.Read(path, ReadLimits.Default, CancellationToken.None);

        Assert.Equal("Berth allocation, spring 2031", content.Title);
        Assert.Equal(PdfinfoTitle(LibreOffice.Convert(path, "pdf")), content.Title);
    }

    [Fact]
    public void An_html_title_and_an_email_subject_are_titles()
    {
        using var temp = new TempDirectory();
        var html = temp.Write("log.html", "<!doctype html><html><head><title>\n  Harbour   log\t7 </title></head><body><p>Pilot rota</p></body></html>");
        var message = new MimeMessage();
        message.From.Add(new MailboxAddress("Harbour office", "office@kellmarsh.example"));
        message.To.Add(new MailboxAddress("Pilots", "pilots@kellmarsh.example"));
        message.Subject = "Dredging notice for the eastern quay";
        message.Body = new TextPart("plain") { Text = "The eastern quay is closed on Tuesday." };
        var eml = temp.Combine("notice.eml");
        message.WriteTo(eml);

        Assert.Equal("Harbour log 7", reader.Read(html, ReadLimits.Default, CancellationToken.None).Title);
        Assert.Equal("Dredging notice for the eastern quay", reader.Read(eml, ReadLimits.Default, CancellationToken.None).Title);
        Assert.Null(reader.Read(temp.Write("rota.txt", "Pilot rota"), ReadLimits.Default, CancellationToken.None).Title);
    }

    [Theory]
    [InlineData("  Tide\u0007 tables\r\n2031\u001b[31m ", "Tide tables 2031 [31m")]
    [InlineData(" \t\r\n", null)]
    [InlineData(null, null)]
    public void Titles_are_cleaned_of_control_characters_and_runs_of_space(string? raw, string? expected) =>
        Assert.Equal(expected, DocumentTitle.Clean(raw));

    [Fact]
    public void A_long_title_is_cut_at_the_limit()
    {
        var cleaned = DocumentTitle.Clean(string.Concat(Enumerable.Repeat("quay ", 200)));

        Assert.NotNull(cleaned);
        Assert.True(cleaned.Length <= DocumentTitle.MaxLength);
        Assert.StartsWith("quay quay", cleaned, StringComparison.Ordinal);
        Assert.False(cleaned.EndsWith(' '));
    }

    private static byte[] Pdf(string? title)
    {
        using var builder = new PdfDocumentBuilder();
        if (title is not null)
        {
            builder.DocumentInformation.Title = title;
        }

        var page = builder.AddPage(595, 842);
        page.AddText("High water 06:12, low water 12:31", 12, new PdfPoint(72, 760), builder.AddStandard14Font(Standard14Font.Helvetica));
        return builder.Build();
    }

    /// <summary>The Title line of poppler's pdfinfo, or null when it prints none.</summary>
    private static string? PdfinfoTitle(string path)
    {
        var (exitCode, output) = ExternalTool.Run("pdfinfo", "-enc", "UTF-8", path);
        Assert.Equal(0, exitCode);
        var line = output.Split('\n').FirstOrDefault(l => l.StartsWith("Title:", StringComparison.Ordinal));
        return line is null ? null : line["Title:".Length..].Trim();
    }
}
