namespace IndexKeeper.Core.Documents;

/// <summary>Hands out the in-process document reader that dispatches on the file's signature.</summary>
public static class DocumentReaderFactory
{
    // Placeholder until the PDF and image readers land: everything is unsupported.
    public static IDocumentReader Create() => new UnsupportedReader();

    private sealed class UnsupportedReader : IDocumentReader
    {
        public DocumentContent Read(string path, ReadLimits limits, CancellationToken cancellationToken) =>
            throw new DocumentReadException(QuarantineReason.Unsupported, "no reader yet");
    }
}
