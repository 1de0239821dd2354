using IndexKeeper.Core.Documents;
using IndexKeeper.Core.Encoding;

namespace IndexKeeper.Benchmarks;

/// <summary>Passes every call to the real encoder and keeps each batch it returned, so the store's share of a sync can be timed alone by appending them again.</summary>
internal sealed class RecordingEncoder(IPageEncoder inner) : IPageEncoder
{
    public List<List<(PageKey Key, VectorSet Vectors)>> Batches { get; } = [];

    public EncoderIdentity Identity => inner.Identity;

    public IReadOnlyList<VectorSet> EncodePages(IReadOnlyList<PageToEncode> pages, CancellationToken cancellationToken)
    {
        var vectors = inner.EncodePages(pages, cancellationToken);
        Batches.Add(pages.Select((page, i) => (page.Key, vectors[i])).ToList());
        return vectors;
    }

    public VectorSet EncodeQuery(string text, CancellationToken cancellationToken) => inner.EncodeQuery(text, cancellationToken);
}
