namespace IndexKeeper.Core.Documents;

/// <summary>Hands out the in-process document reader that dispatches on the file's signature.</summary>
public static class DocumentReaderFactory
{
    public static IDocumentReader Create(ReaderSettings? settings = null) => new SignatureDocumentReader(settings ?? ReaderSettings.Default);
}
