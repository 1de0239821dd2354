namespace IndexKeeper.Core.Encoding;

/// <summary>
/// Turns pages into vector sets and queries into query vectors. Implementations are deterministic for a
/// given <see cref="Identity"/>: the same input gives the same vectors in any process.
/// </summary>
public interface IPageEncoder
{
    EncoderIdentity Identity { get; }

    /// <summary>Encodes a batch; the result has one vector set per page, in order.</summary>
    IReadOnlyList<VectorSet> EncodePages(IReadOnlyList<PageToEncode> pages, CancellationToken cancellationToken);

    /// <summary>Encodes a query into its token vectors (regions are empty boxes).</summary>
    VectorSet EncodeQuery(string text, CancellationToken cancellationToken);
}
