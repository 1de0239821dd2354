using IndexKeeper.Core.Catalog;
using IndexKeeper.Core.Detect;
using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Pipeline;
using IndexKeeper.Core.Storage;
using IndexKeeper.Tests.Demo;
using IndexKeeper.Tests.Detect;
using IndexKeeper.Tests.Readers;
using IndexKeeper.Tests.Support;

namespace IndexKeeper.Tests.Pipeline;

/// <summary>
/// An office converter upgrade. Converted pages' keys name the LibreOffice that drew them, so documents
/// drawn by another version are read again: the plan shows the pages to embed before any sync does it,
/// the sync re-keys only the drawn documents, and documents recorded before converters were kept are
/// stamped, not read. The converter is Debian's LibreOffice behind a wrapper that answers
/// <c>--version</c> with a version line of the test's choosing (an upgrade replaces that file).
/// </summary>
public sealed class ConverterUpgradeTests : IDisposable
{
    private const string Before = "LibreOffice 7.4.7.2 (wrapper build one)";
    private const string After = "LibreOffice 7.4.7.2 (wrapper build two, rebuilt)";

    private readonly TempDirectory temp = new();
    private readonly IndexLock heldLock;
    private readonly IndexCatalog catalog;
    private readonly PageWordStore words;
    private readonly string converter;

    public ConverterUpgradeTests()
    {
        heldLock = IndexLock.Acquire(temp.Combine("index"), "test");
        catalog = IndexCatalog.Open(heldLock);
        words = PageWordStore.OpenForWriting(temp.Combine("index"));
        converter = temp.Combine("tools", "soffice");
        File.WriteAllBytes(temp.Write("a/berths.docx", string.Empty), OfficeSamples.Letter("R. Tamsett", new DateTime(2031, 3, 10, 9, 0, 0, DateTimeKind.Utc)));
        temp.Write("a/berth-rota.txt", "Berth rota for the spring season at the eastern quay");
        Install(Before);
    }

    [LinuxFact]
    public void An_upgrade_is_planned_then_re_keys_only_the_drawn_pages()
    {
        var first = Scan();
        Assert.Equal(2L, first.DocumentsRead);
        var letter = Document("berths.docx");
        Assert.Equal(Before, letter.Converter);
        Assert.Null(Document("berth-rota.txt").Converter);
        var keysBefore = letter.PageKeys.ToList();
        Assert.Equal(2, keysBefore.Count);
        Assert.Equal(0L, Scan().DocumentsRead);

        Install(After);

        // The plan reads the letter again and counts its two pages as new, writing nothing.
        var preview = Pass().Preview(CancellationToken.None);
        Assert.Equal((1L, 1L, 2L), (preview.Summary.DocumentsReread, preview.Summary.DocumentsRead, preview.Summary.PagesNew));
        Assert.Equal(keysBefore, Document("berths.docx").PageKeys);
        Assert.Equal(Before, Document("berths.docx").Converter);

        var sync = Scan();
        Assert.Equal((1L, 1L, 2L), (sync.DocumentsReread, sync.DocumentsRead, sync.PagesNew));
        letter = Document("berths.docx");
        Assert.Equal(After, letter.Converter);
        Assert.Empty(letter.PageKeys.Intersect(keysBefore));
        Assert.All(letter.PageKeys, k => Assert.Contains(catalog.Queue.Keys(), q => q.PageKey == k));
        Assert.Equal(0L, Scan().DocumentsRead);
    }

    [LinuxFact]
    public void A_document_recorded_before_converters_were_kept_is_stamped_not_read()
    {
        Scan();
        var keys = Document("berths.docx").PageKeys.ToList();
        var edit = new CatalogEdit();
        var letter = Document("berths.docx");
        letter.Converter = null;
        edit.PutDocuments.Add(letter);
        catalog.Apply(edit);

        var pass = Scan();

        Assert.Equal(0L, pass.DocumentsRead);
        Assert.Equal(Before, Document("berths.docx").Converter);
        Assert.Equal(keys, Document("berths.docx").PageKeys);
    }

    public void Dispose()
    {
        words.Dispose();
        catalog.Dispose();
        heldLock.Dispose();
        temp.Dispose();
    }

    /// <summary>Puts a converter that draws with Debian's LibreOffice and names itself <paramref name="versionLine"/> (a new file, as a package upgrade writes).</summary>
    private void Install(string versionLine)
    {
        var soffice = ExternalTool.Run("sh", "-c", "command -v soffice").Output.Trim();
        if (File.Exists(converter))
        {
            File.Delete(converter);
        }

        temp.Write("tools/soffice", $"#!/bin/sh\nif [ \"$1\" = \"--version\" ]; then echo '{versionLine}'; exit 0; fi\nexec '{soffice}' \"$@\"\n");
        if (!OperatingSystem.IsWindows())
        {
            File.SetUnixFileMode(converter, UnixFileMode.UserRead | UnixFileMode.UserWrite | UnixFileMode.UserExecute);
        }
    }

    private DocumentRecord Document(string path) => catalog.Documents.All().Single(d => d.Path == path);

    private ScanPass Pass()
    {
        var settings = new ScanSettings([new RootSpec("a", temp.Combine("a"), [], [])], ReadLimits.Default, TimeSpan.Zero, 256, OfficeConverter: converter);
        return new ScanPass(catalog, words, DocumentReaderFactory.Create(ReaderSettings.Default with { OfficeConverter = converter }), settings);
    }

    private ScanSummary Scan() => Pass().Run("test", CancellationToken.None);
}
