namespace IndexKeeper.Core.Documents;

/// <summary>
/// Reads a document file into pages with page keys and words. Throws <see cref="DocumentReadException"/>
/// for a file that must be quarantined; any other exception is a bug or a crash of the reader.
/// </summary>
public interface IDocumentReader
{
    DocumentContent Read(string path, ReadLimits limits, CancellationToken cancellationToken);
}
