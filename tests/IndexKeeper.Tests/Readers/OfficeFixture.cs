using IndexKeeper.Core.Documents;
using IndexKeeper.Tests.Demo;

namespace IndexKeeper.Tests.Readers;

/// <summary>
/// Office documents made once for all office tests (conversions are slow): each read by the reader, and
/// each exported by LibreOffice's own command line and counted by poppler's pdfinfo.
/// </summary>
public sealed class OfficeFixture : IDisposable
{
    public OfficeFixture()
    {
        Folder = Directory.CreateTempSubdirectory("indexkeeper-office-").FullName;
        var letter = Write("letter.docx", OfficeSamples.Letter("R. Pennock", new DateTime(2024, 3, 1, 9, 15, 0, DateTimeKind.Utc)));
        var resaved = Write("letter-resaved.docx", OfficeSamples.Letter("T. Okafor", new DateTime(2025, 11, 20, 17, 42, 0, DateTimeKind.Utc)));
        var workbook = Write("fees.xlsx", OfficeSamples.Workbook(rows: 12));
        var deck = Write("quay.pptx", OfficeSamples.Deck(3));
        var opendocument = LibreOffice.Convert(letter, "odt");
        foreach (var path in new[] { letter, workbook, deck, opendocument })
        {
            Read[Path.GetExtension(path)] = Reader.Read(path, ReadLimits.Default, CancellationToken.None);
            ReferencePages[Path.GetExtension(path)] = ExternalTool.PdfinfoPageCount(LibreOffice.Convert(path, "pdf"));
        }

        Resaved = Reader.Read(resaved, ReadLimits.Default, CancellationToken.None);
    }

    public string Folder { get; }

    public IDocumentReader Reader { get; } = DocumentReaderFactory.Create();

    /// <summary>What the reader made of each document, by extension (.docx, .xlsx, .pptx, .odt).</summary>
    public Dictionary<string, DocumentContent> Read { get; } = [];

    /// <summary>pdfinfo's page count of LibreOffice's own PDF export, by extension.</summary>
    public Dictionary<string, int> ReferencePages { get; } = [];

    /// <summary>The letter saved again with another author and other dates.</summary>
    public DocumentContent Resaved { get; }

    public string Write(string name, byte[] bytes)
    {
        var path = Path.Combine(Folder, name);
        File.WriteAllBytes(path, bytes);
        return path;
    }

    public void Dispose() => Directory.Delete(Folder, recursive: true);
}
