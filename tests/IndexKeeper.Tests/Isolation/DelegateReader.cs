using IndexKeeper.Core.Documents;

namespace IndexKeeper.Tests.Isolation;

/// <summary>An in-process reader whose behaviour a test supplies.</summary>
internal sealed class DelegateReader(Func<string, ReadLimits, CancellationToken, DocumentContent> read) : IDocumentReader
{
    public DocumentContent Read(string path, ReadLimits limits, CancellationToken cancellationToken) => read(path, limits, cancellationToken);
}
