using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Detect;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Pipeline;
using IndexKeeper.Core.Storage;
using IndexKeeper.Tests.Detect;
using IndexKeeper.Tests.Readers;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Pipeline;

/// <summary>
/// Unchanged documents read again. Those read by an older build (<see cref="ReaderVersion"/>) are read once
/// more when this build's readers can give more: a scan indexed without words gets OCR words under a new key,
/// which is embedded; a document that reads the same is only stamped; a re-read never costs a live document
/// its pages. Those quarantined because a program was missing are read again once it is installed; while it
/// is still missing one read per pass proves it for all of them.
/// </summary>
public sealed class RereadTests : IDisposable
{
    private readonly TempDirectory temp = new();
    private readonly IndexLock heldLock;
    private readonly IndexCatalog catalog;
    private readonly PageWordStore words;

    public RereadTests()
    {
        heldLock = IndexLock.Acquire(temp.Combine("index"), "test");
        catalog = IndexCatalog.Open(heldLock);
        words = PageWordStore.OpenForWriting(temp.Combine("index"));
    }

    [LinuxFact]
    public void A_scan_indexed_without_words_is_read_again_with_ocr_under_a_new_key()
    {
        // Before: an unchanged file was never read again, so scans indexed before OCR kept no words for ever.
        File.WriteAllBytes(temp.Write("a/dredging-notice.png", string.Empty), OcrTests.Render("Kellmarsh dredging notice"));
        temp.Write("a/berth-rota.txt", "Berth rota for the spring season at the eastern quay");
        Scan(DocumentReaderFactory.Create(ReaderSettings.Default with { Ocr = false }));
        var scan = Document("dredging-notice.png");
        var oldKey = Assert.Single(scan.PageKeys);
        Assert.Empty(PageInput.WordsOf(catalog.Pages.Find(oldKey)!, words));
        AsReadByAnOlderBuild();

        var pass = Scan(DocumentReaderFactory.Create());

        Assert.Equal((1L, 1L), (pass.DocumentsReread, pass.DocumentsRead));
        var newKey = Assert.Single(Document("dredging-notice.png").PageKeys);
        Assert.NotEqual(oldKey, newKey);
        Assert.Null(catalog.Pages.Find(oldKey));
        Assert.Contains(PageInput.WordsOf(catalog.Pages.Find(newKey)!, words), w => w.Text == "dredging");
        Assert.Contains(catalog.Queue.Keys(), q => q.PageKey == newKey);
        Assert.All(catalog.Documents.All(), d => Assert.Equal(ReaderVersion.Current, d.ReaderVersion));
        Assert.Equal(0L, Scan(DocumentReaderFactory.Create()).DocumentsRead);
    }

    [LinuxFact]
    public void A_reread_that_meets_a_missing_program_keeps_the_document_as_it_was()
    {
        File.WriteAllBytes(temp.Write("a/dredging-notice.png", string.Empty), OcrTests.Render("Kellmarsh dredging notice"));
        File.WriteAllBytes(temp.Write("a/mooring-fees.png", string.Empty), OcrTests.Render("Kellmarsh mooring fees"));
        Scan(DocumentReaderFactory.Create(ReaderSettings.Default with { Ocr = false }));
        var before = catalog.Documents.All().ToDictionary(d => d.Path, d => string.Join(",", d.PageKeys));
        AsReadByAnOlderBuild();

        var pass = Scan(DocumentReaderFactory.Create(ReaderSettings.Default with { OcrProgram = temp.Combine("tools", "tesseract") }));

        // One read finds the program missing and holds the other re-read; both stay live with their pages.
        Assert.Equal((1L, 0L), (pass.DocumentsRead, pass.DocumentsQuarantined));
        Assert.Contains(pass.Problems, p => p.Contains("kept as it was", StringComparison.Ordinal));
        Assert.All(catalog.Documents.All(), d => Assert.Equal((DocumentState.Live, before[d.Path], 0), (d.State, string.Join(",", d.PageKeys), d.ReaderVersion)));
    }

    [LinuxFact]
    public void Scans_waiting_on_a_missing_ocr_program_are_read_once_it_is_installed()
    {
        // Before: a quarantine for a missing program lasted until the file itself changed.
        File.WriteAllBytes(temp.Write("a/dredging-notice.png", string.Empty), OcrTests.Render("Kellmarsh dredging notice"));
        File.WriteAllBytes(temp.Write("a/mooring-fees.png", string.Empty), OcrTests.Render("Kellmarsh mooring fees"));
        var program = temp.Combine("tools", "tesseract");
        var reader = DocumentReaderFactory.Create(ReaderSettings.Default with { OcrProgram = program });

        var first = Scan(reader);
        Assert.Equal((2L, 2L), (first.DocumentsRead, first.DocumentsQuarantined));
        Assert.All(catalog.Documents.All(), d => Assert.Equal(QuarantineReason.ToolMissing, d.QuarantineReason));

        var stillMissing = Scan(reader);
        Assert.Equal((1L, 2L, 0L), (stillMissing.DocumentsRead, stillMissing.DocumentsUnchanged, stillMissing.DocumentsChanged));

        // "Installing" it: Debian's tesseract (package tesseract-ocr) appears at the configured path.
        Directory.CreateDirectory(Path.GetDirectoryName(program)!);
        File.CreateSymbolicLink(program, "/usr/bin/tesseract");
        var installed = Scan(reader);
        Assert.Equal((2L, 2L), (installed.DocumentsRead, installed.DocumentsChanged));
        Assert.All(catalog.Documents.All(), d => Assert.Equal(DocumentState.Live, d.State));
        Assert.Equal(0L, Scan(reader).DocumentsRead);
    }

    public void Dispose()
    {
        words.Dispose();
        catalog.Dispose();
        heldLock.Dispose();
        temp.Dispose();
    }

    /// <summary>What a build from before reader versions left: every document without one.</summary>
    private void AsReadByAnOlderBuild()
    {
        var edit = new CatalogEdit();
        foreach (var document in catalog.Documents.All())
        {
            document.ReaderVersion = 0;
            edit.PutDocuments.Add(document);
        }

        catalog.Apply(edit);
    }

    private DocumentRecord Document(string path) => catalog.Documents.All().Single(d => d.Path == path);

    private ScanSummary Scan(IDocumentReader reader)
    {
        var settings = new ScanSettings([new RootSpec("a", temp.Combine("a"), [], [])], ReadLimits.Default, TimeSpan.Zero, 256);
        return new ScanPass(catalog, words, reader, settings).Run("test", CancellationToken.None);
    }
}
