using System.Text.RegularExpressions;
using IndexKeeper.Demo;

namespace IndexKeeper.Tests.Demo;

public sealed partial class PdfTrailerIdTests
{
    [Fact]
    public void The_file_identifier_is_permanent_per_document_and_follows_the_content()
    {
        var info = new DemoPdfInfo("Title", "Author", "Subject", "D:20260302090000Z", "D:20260302090000Z");
        byte[] first = Build("form/IF-0101", info, "Site check");
        byte[] again = Build("form/IF-0101", info, "Site check");
        byte[] retitled = Build("form/IF-0101", info with { Title = "Other title" }, "Site check");
        byte[] otherDocument = Build("form/IF-0102", info, "Site check");

        Assert.Equal(first, again);
        // ISO 32000-1 §14.4: the first string identifies the document for good, the second its present content.
        var (permanent, changing) = Identifier(first);
        Assert.Equal((permanent, changing), Identifier(again));
        Assert.Equal(permanent, Identifier(retitled).Permanent);
        Assert.NotEqual(changing, Identifier(retitled).Changing);
        Assert.NotEqual(permanent, Identifier(otherDocument).Permanent);
    }

    [Fact]
    public void The_rewritten_file_passes_qpdf_check()
    {
        string path = Path.Combine(Path.GetTempPath(), "indexkeeper-trailer-" + Guid.NewGuid().ToString("N") + ".pdf");
        try
        {
            File.WriteAllBytes(path, Build("form/IF-0101", new DemoPdfInfo("T", "A", "S", "D:20260302090000Z", "D:20260302090000Z"), "text"));
            // qpdf manual, "Exit Status": 0 means no errors or warnings.
            var (exitCode, output) = ExternalTool.Run("qpdf", "--check", path);
            Assert.True(exitCode == 0, output);
        }
        finally
        {
            File.Delete(path);
        }
    }

    private static byte[] Build(string identity, DemoPdfInfo info, string text)
    {
        var composer = new PdfComposer(identity, info);
        composer.AddPage(PaperSize.A4).Text(text, 72, 720, 12);
        return composer.Build();
    }

    private static (string Permanent, string Changing) Identifier(byte[] pdf)
    {
        var match = IdEntry().Match(System.Text.Encoding.ASCII.GetString(pdf));
        Assert.True(match.Success);
        return (match.Groups[1].Value, match.Groups[2].Value);
    }

    [GeneratedRegex(@"/ID \[ ?<([0-9A-F]{32})><([0-9A-F]{32})>")]
    private static partial Regex IdEntry();
}
