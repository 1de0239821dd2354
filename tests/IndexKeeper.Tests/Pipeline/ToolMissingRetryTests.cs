using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Detect;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Pipeline;
using IndexKeeper.Tests.Detect;
using IndexKeeper.Tests.Readers;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Pipeline;

/// <summary>
/// Documents quarantined because a program was missing are read again once it is installed, with no change
/// to the files; while it is still missing one read per pass proves it for all of them.
/// </summary>
public sealed class ToolMissingRetryTests : IDisposable
{
    private readonly TempDirectory temp = new();
    private readonly IndexLock heldLock;
    private readonly IndexCatalog catalog;

    public ToolMissingRetryTests()
    {
        heldLock = IndexLock.Acquire(temp.Combine("index"), "test");
        catalog = IndexCatalog.Open(heldLock);
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
        catalog.Dispose();
        heldLock.Dispose();
        temp.Dispose();
    }

    private ScanSummary Scan(IDocumentReader reader)
    {
        var settings = new ScanSettings([new RootSpec("a", temp.Combine("a"), [], [])], ReadLimits.Default, TimeSpan.Zero, 256);
        return new ScanPass(catalog, reader, settings).Run("test", CancellationToken.None);
    }
}
