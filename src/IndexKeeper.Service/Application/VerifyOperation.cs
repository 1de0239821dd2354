using IndexKeeper.Core.Pipeline;

namespace IndexKeeper.Service.Application;

/// <summary><c>verify</c>: integrity of catalog and segments (<see cref="IndexVerifier"/>); damaged segments are isolated.</summary>
public sealed class VerifyOperation(OpenIndex index)
{
    public VerifyReport Run(CancellationToken cancellationToken) =>
        IndexVerifier.Verify(index.Catalog, index.Store, index.Encoder.Identity.Id, cancellationToken);
}
