using IndexKeeper.Tests.Documents;

namespace IndexKeeper.Tests.EndToEnd;

/// <summary>
/// Multi-page PDFs of the demo scenario, written by PdfPig's builder (SampleDocuments.Builder): every page
/// of every document shows its own line, so no two pages share a page key unless a test copies them, and
/// qpdf (Debian's package) for the page-level rewrites a user's tools make.
/// </summary>
internal static class StorePdfs
{
    /// <summary>A document of <paramref name="pages"/> pages; page <paramref name="editedPage"/>, when given, shows <paramref name="editedLine"/> instead.</summary>
    public static byte[] Document(string tag, int pages, int editedPage = 0, string? editedLine = null) =>
        SampleDocuments.Builder(pages, p => p == editedPage && editedLine is not null ? editedLine : $"Harrowmere {tag} register, entry {p}");

    /// <summary>Runs qpdf with <paramref name="arguments"/> (full paths) writing <paramref name="output"/> in the scratch folder, and returns the output's bytes.</summary>
    public static byte[] Qpdf(CliIndex index, string output, params string[] arguments)
    {
        var target = Path.Combine(index.Scratch, output);
        Documents.Qpdf.Run([.. arguments, target]);
        return File.ReadAllBytes(target);
    }

    /// <summary>Puts bytes into the scratch folder under <paramref name="name"/> (a qpdf input) and returns its path.</summary>
    public static string ToScratch(CliIndex index, string name, byte[] bytes)
    {
        var path = Path.Combine(index.Scratch, name);
        File.WriteAllBytes(path, bytes);
        return path;
    }
}
