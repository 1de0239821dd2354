using IndexKeeper.Tests.Demo;
using IndexKeeper.Tests.Documents;

namespace IndexKeeper.Tests.EndToEnd;

/// <summary>
/// Issue 2's scenarios inside one document, on real PDFs through the real reader worker (<c>scan --json</c>):
/// pages inserted, deleted and reordered by Debian's qpdf, a touch that changes only the modification
/// time, and a save that changes only document metadata (an incremental update, ISO 32000-1 §7.5.6).
/// </summary>
public sealed class ScanPageEditTests : IDisposable
{
    private const string Manual = "works/chlorination-manual.pdf";
    private readonly CliIndex index = new("works");

    [Fact]
    public void Page_edits_cost_only_new_page_keys_and_touches_and_metadata_saves_cost_none()
    {
        index.Put(Manual, StorePdfs.Document("chlorination", 6));
        ContractAssert.Counts(index.Json("scan"), "first scan", ("documentsNew", 1), ("pagesSeen", 6), ("pagesNew", 6));

        // Metadata only: a new /Info dictionary appended as an incremental update; every page is as it was.
        var original = index.Get(Manual);
        var info = HandWrittenPdf.SizeOf(original);
        index.Put(Manual, HandWrittenPdf.AppendUpdate(
            original,
            new Dictionary<int, byte[]> { [info] = HandWrittenPdf.Latin1("<< /Title (Chlorination manual, revised) /Author (Harrowmere treatment works) /ModDate (D:20261201090000Z) >>") },
            $"/Info {info} 0 R"));

        // poppler's pdfinfo, an independent reader, sees the new title: the update is a valid one.
        Assert.Contains("Chlorination manual, revised", ExternalTool.Run("pdfinfo", index.PathOf(Manual)).Output, StringComparison.Ordinal);
        ContractAssert.Counts(
            index.Json("scan"),
            "metadata-only save",
            ("documentsChanged", 1),
            ("documentsRead", 1),
            ("pagesSeen", 6),
            ("pagesNew", 0),
            ("pagesReused", 6),
            ("pagesRemoved", 0));

        // Touch: the modification time moves, the bytes stay: one hash, no parse.
        File.SetLastWriteTimeUtc(index.PathOf(Manual), DateTime.UtcNow.AddHours(-2));
        ContractAssert.Counts(
            index.Json("scan"),
            "touch",
            ("documentsUnchanged", 1),
            ("documentsChanged", 0),
            ("filesHashed", 1),
            ("documentsRead", 0),
            ("pagesNew", 0),
            ("pagesReused", 0));

        // In one save, insert a page from another document after page 3 and drop page 5 (qpdf --pages,
        // Debian's qpdf); poppler's pdfinfo confirms the page count independently.
        var current = StorePdfs.ToScratch(index, "current.pdf", index.Get(Manual));
        var insert = StorePdfs.ToScratch(index, "insert.pdf", StorePdfs.Document("dosing-pump", 1));
        index.Put(Manual, StorePdfs.Qpdf(index, "inserted.pdf", "--empty", "--pages", current, "1-3", insert, "1", current, "4,6", "--"));
        Assert.Equal(6, ExternalTool.PdfinfoPageCount(index.PathOf(Manual)));
        ContractAssert.Counts(
            index.Json("scan"),
            "insert a page, delete another",
            ("documentsChanged", 1),
            ("pagesSeen", 6),
            ("pagesNew", 1),
            ("pagesReused", 5),
            ("pagesRemoved", 1));

        // Reorder: the first page moves to the end ("2-z,1"; qpdf 11.3 reads a lone "1" as a file name).
        current = StorePdfs.ToScratch(index, "current.pdf", index.Get(Manual));
        index.Put(Manual, StorePdfs.Qpdf(index, "reordered.pdf", current, "--pages", current, "2-z,1", "--"));
        ContractAssert.Counts(index.Json("scan"), "reorder", ("documentsChanged", 1), ("pagesSeen", 6), ("pagesNew", 0), ("pagesReused", 6), ("pagesRemoved", 0));
    }

    public void Dispose() => index.Dispose();
}
