using IndexKeeper.Core.Documents;

namespace IndexKeeper.Tests.Support;

/// <summary>
/// A stand-in reader for scan tests (invented format, tests only): every line of a text file is one page
/// whose key is SHA-256 of the line, so tests can write documents page by page without a PDF library.
/// A file starting with "BAD" is quarantined as corrupt. <see cref="OnRead"/> lets a test act mid-read.
/// </summary>
public sealed class LinePageReader : IDocumentReader
{
    public int Reads { get; private set; }

    public Action<string>? OnRead { get; set; }

    public DocumentContent Read(string path, ReadLimits limits, CancellationToken cancellationToken)
    {
        Reads++;
        var text = File.ReadAllText(path);
        OnRead?.Invoke(path);
        if (text.StartsWith("BAD", StringComparison.Ordinal))
        {
            throw new DocumentReadException(QuarantineReason.Corrupt, "test file marked bad");
        }

        var lines = text.Split('\n', StringSplitOptions.RemoveEmptyEntries);
        var pages = lines.Select((line, i) => new PageContent(
            i + 1,
            PageKey.Of(System.Text.Encoding.UTF8.GetBytes(line)),
            612,
            792,
            0,
            line.Split(' ', StringSplitOptions.RemoveEmptyEntries).Select((w, j) => new PageWord(w, new PageBox(j * 10, 0, j * 10 + 8, 10))).ToList()))
            .ToList();
        return new DocumentContent(DocumentKind.Pdf, pages);
    }
}
